/**
 * Writes a demo set of part photos with their truth.json:
 *   npm run demo:images -- --out DIR [--count N] [--seed S] [--family bracket,washer] [--sizes 640x480,1296x972]
 *                          [--retake-share 0.1] [--defect-share 0.33]
 * Exit status: 0 written, 1 failed while writing, 2 bad arguments.
 */
import path from 'node:path';
import {
  FAMILY_NAMES,
  isFamilyName,
  parseFrameSize,
  resolveOptions,
  writeDataset,
  type DatasetOptions,
  type FamilyName,
} from '../demo';

const USAGE = `Usage: npm run demo:images -- --out DIR [options]
  --out DIR             folder to write the photos and truth.json into (created if missing)
  --count N             number of photos (default 30)
  --seed S              whole number 0..4294967295; the same seed gives the same files (default 1)
  --family LIST         part families, comma separated: ${FAMILY_NAMES.join(', ')} (default all)
  --sizes LIST          frame sizes, comma separated, e.g. 640x480,1296x972 (default 640x480 to 2592x1944)
  --retake-share X      share of deliberately unusable photos, 0..1 (default 0.1)
  --defect-share X      share of defective parts, 0..1 (default 0.33)
  --help                show this text`;

class ArgumentError extends Error {}

const VALUE_FLAGS = ['--out', '--count', '--seed', '--family', '--sizes', '--retake-share', '--defect-share'] as const;
type ValueFlag = (typeof VALUE_FLAGS)[number];

function readFlags(argv: string[]): Map<ValueFlag, string> {
  const flags = new Map<ValueFlag, string>();
  for (let i = 0; i < argv.length; i++) {
    const [name, inline] = argv[i].split(/=(.*)/s, 2);
    if (!(VALUE_FLAGS as readonly string[]).includes(name)) throw new ArgumentError(`Unknown argument "${argv[i]}"`);
    const value = inline ?? argv[++i];
    if (value === undefined || value.startsWith('--')) throw new ArgumentError(`${name} needs a value`);
    if (flags.has(name as ValueFlag)) throw new ArgumentError(`${name} is given twice`);
    flags.set(name as ValueFlag, value);
  }
  return flags;
}

function wholeNumber(flag: string, text: string): number {
  if (!/^\d+$/.test(text)) throw new ArgumentError(`${flag} expects a whole number but received "${text}"`);
  return Number(text);
}

function share(flag: string, text: string): number {
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || value < 0 || value > 1) {
    throw new ArgumentError(`${flag} expects a number between 0 and 1 but received "${text}"`);
  }
  return value;
}

function list(text: string): string[] {
  return text.split(',').map((item) => item.trim()).filter((item) => item !== '');
}

function parseArguments(argv: string[]): { out: string; options: DatasetOptions } {
  const flags = readFlags(argv);
  const out = flags.get('--out');
  if (!out) throw new ArgumentError('--out DIR is required');
  const options: DatasetOptions = {
    count: wholeNumber('--count', flags.get('--count') ?? '30'),
    seed: wholeNumber('--seed', flags.get('--seed') ?? '1'),
  };
  const families = flags.get('--family');
  if (families !== undefined) {
    options.families = list(families).map((name): FamilyName => {
      if (!isFamilyName(name)) {
        throw new ArgumentError(`--family: unknown part family "${name}"; expected ${FAMILY_NAMES.join(', ')}`);
      }
      return name;
    });
  }
  const sizes = flags.get('--sizes');
  if (sizes !== undefined) {
    options.sizes = list(sizes).map((size) => {
      try {
        return parseFrameSize(size);
      } catch (error) {
        throw new ArgumentError(`--sizes: ${(error as Error).message}`);
      }
    });
  }
  const retakeShare = flags.get('--retake-share');
  if (retakeShare !== undefined) options.retakeShare = share('--retake-share', retakeShare);
  const defectShare = flags.get('--defect-share');
  if (defectShare !== undefined) options.defectShare = share('--defect-share', defectShare);
  return { out: path.resolve(out), options };
}

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(USAGE);
    return 0;
  }
  let out: string;
  let options: DatasetOptions;
  try {
    ({ out, options } = parseArguments(argv));
    // The generator's own checks (ranges, shares adding up) also count as bad arguments.
    resolveOptions(options);
  } catch (error) {
    console.error(`demo:images: ${(error as Error).message}\n\n${USAGE}`);
    return 2;
  }

  const started = performance.now();
  let lastReport = 0;
  const counts = { good: 0, defective: 0, retake: 0 };
  try {
    await writeDataset(out, options, (done, total, image) => {
      counts[image.truth.label] += 1;
      const now = performance.now();
      if (total <= 100 || done === total || now - lastReport >= 1000) {
        lastReport = now;
        const { width, height, bitDepth, colour, label, retakeReason, defects } = image.truth;
        const detail = label === 'retake' ? ` (${retakeReason})` : label === 'defective' ? ` (${defects.map((d) => d.kind).join(', ')})` : '';
        const width0 = String(total).length;
        console.log(
          `[${String(done).padStart(width0)}/${total}] ${image.fileName} ${width}x${height} ${colour ? 'colour' : 'grey'} ${bitDepth}-bit ${label}${detail}`,
        );
      }
    });
  } catch (error) {
    console.error(`demo:images: failed: ${(error as Error).message}`);
    return 1;
  }
  const seconds = (performance.now() - started) / 1000;
  console.log(
    `Wrote ${options.count} photos and truth.json to ${out} in ${seconds.toFixed(1)} s ` +
      `(good ${counts.good}, defective ${counts.defective}, retake ${counts.retake}).`,
  );
  return 0;
}

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
