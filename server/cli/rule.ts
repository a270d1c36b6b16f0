// The rule command, for engineers' scripts and batch work (DESIGN.md, "The rule command"):
//   rule run --rule RULE.json --image PHOTO --out DIR [--npy] [--station-scale MM_PER_PX]
//   rule validate RULE.json
// Exit status: 0 PASS, 1 FAIL, 2 RETAKE, 3 invalid input (the message names what is wrong),
// 4 an unexpected failure of the command itself.
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { validateRuleDocument } from '../../shared/rules/schema';
import { RuleRunError, runValidatedRule, type RuleRun, type Verdict } from '../../shared/vision/pipeline';
import { unitSuffix } from '../../shared/rules/units';
import { PhotoDecodeError, decodePhoto } from '../vision/decode';
import { displayPng, evidencePng } from '../vision/encode';
import { KernelLibraryError, loadKernelLibrary } from '../vision/kernel-library';
import { npyFloat32 } from '../vision/npy';

export const EXIT: Record<Verdict | 'INVALID' | 'ERROR', number> = { PASS: 0, FAIL: 1, RETAKE: 2, INVALID: 3, ERROR: 4 };

const USAGE = `usage:
  npm run -s rule -- run --rule RULE.json --image PHOTO --out DIR [--npy] [--station-scale MM_PER_PX]
  npm run -s rule -- validate RULE.json
exit status: 0 PASS, 1 FAIL, 2 RETAKE, 3 invalid input`;

/** A problem with what the user gave the command: exit status 3. */
class InvalidInput extends Error {}

interface RunArguments {
  rule: string;
  image: string;
  out: string;
  npy: boolean;
  stationScale?: number;
}

function parseRunArguments(args: string[]): RunArguments {
  const values: Record<string, string> = {};
  let npy = false;
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (arg === '--npy') {
      npy = true;
    } else if (['--rule', '--image', '--out', '--station-scale'].includes(arg)) {
      const value = args[++i];
      if (value === undefined || value.startsWith('--')) throw new InvalidInput(`${arg} needs a value`);
      values[arg.slice(2)] = value;
    } else {
      throw new InvalidInput(`unknown argument "${arg}"`);
    }
  }
  for (const required of ['rule', 'image', 'out']) {
    if (!values[required]) throw new InvalidInput(`--${required} is required`);
  }
  let stationScale: number | undefined;
  if (values['station-scale'] !== undefined) {
    stationScale = Number(values['station-scale']);
    if (!(Number.isFinite(stationScale) && stationScale > 0)) {
      throw new InvalidInput(`--station-scale must be a positive number of millimetres per pixel, got "${values['station-scale']}"`);
    }
  }
  return { rule: values.rule, image: values.image, out: values.out, npy, stationScale };
}

async function readRuleFile(file: string): Promise<unknown> {
  let text: string;
  try {
    text = await fs.readFile(file, 'utf8');
  } catch (e) {
    throw new InvalidInput(`cannot read the rule file ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    throw new InvalidInput(`the rule file ${file} is not valid JSON: ${(e as Error).message}`);
  }
}

/** Every problem of a rule document, including kernel names the library does not have. */
async function ruleProblems(document: unknown): Promise<{ path: string; message: string }[]> {
  const validation = validateRuleDocument(document);
  if (!validation.ok) return validation.issues;
  const library = await loadKernelLibrary();
  return validation.rule.steps.flatMap((step, i) =>
    step.op === 'kernel' && step.kernel !== undefined && !library.has(step.kernel)
      ? [{ path: `steps[${i}].kernel`, message: `no kernel named "${step.kernel}" in the kernel library` }]
      : [],
  );
}

async function validateCommand(args: string[]): Promise<number> {
  if (args.length !== 1) throw new InvalidInput('validate takes exactly one rule file');
  const problems = await ruleProblems(await readRuleFile(args[0]));
  if (problems.length === 0) {
    process.stdout.write(`${args[0]}: valid\n`);
    return 0;
  }
  for (const p of problems) process.stderr.write(`${args[0]}: ${p.path}: ${p.message}\n`);
  return EXIT.INVALID;
}

function resultDocument(run: RuleRun) {
  return {
    verdict: run.verdict,
    measurements: run.measurements.map((m) => ({
      name: m.name,
      value: Number.isFinite(m.value) ? m.value : null,
      unit: m.unit,
      limits: m.limits,
      pass: m.pass,
    })),
    quality: {
      focus: run.quality.focus,
      clipped: run.quality.clipped,
      mean: run.quality.mean,
      pass: run.quality.pass,
      problems: run.quality.problems,
    },
    steps: run.steps.map((s) => ({ op: s.op, ms: Math.round(s.ms * 1000) / 1000 })),
  };
}

async function runCommand(args: string[]): Promise<number> {
  const options = parseRunArguments(args);
  const document = await readRuleFile(options.rule);
  const validation = validateRuleDocument(document);
  if (!validation.ok) {
    for (const p of validation.issues) process.stderr.write(`${options.rule}: ${p.path}: ${p.message}\n`);
    throw new InvalidInput(`the rule ${options.rule} is invalid (${validation.issues.length} problem(s))`);
  }
  let bytes: Buffer;
  try {
    bytes = await fs.readFile(options.image);
  } catch (e) {
    throw new InvalidInput(`cannot read the image ${options.image}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  const photo = await decodePhoto(bytes);
  const run = runValidatedRule(validation.rule, photo, {
    kernels: await loadKernelLibrary(),
    mmPerPx: options.stationScale,
  });

  await fs.mkdir(options.out, { recursive: true });
  const writes: Promise<void>[] = [
    fs.writeFile(path.join(options.out, 'result.json'), JSON.stringify(resultDocument(run), null, 2) + '\n'),
    evidencePng(run).then((png) => fs.writeFile(path.join(options.out, 'evidence.png'), png)),
  ];
  for (const step of run.steps) {
    const nn = String(step.index).padStart(2, '0');
    const output = step.output!;
    writes.push(displayPng(output, step.kind, run.bitDepth).then((png) => fs.writeFile(path.join(options.out, `step-${nn}.png`), png)));
    if (options.npy) writes.push(fs.writeFile(path.join(options.out, `step-${nn}.npy`), npyFloat32(output)));
  }
  await Promise.all(writes);
  process.stdout.write(`${run.verdict}  ${validation.rule.name}  (${run.ms.toFixed(1)} ms)\n`);
  for (const m of run.measurements) {
    process.stdout.write(`  ${m.pass ? 'pass' : 'FAIL'}  ${m.name}: ${m.value}${unitSuffix(m.unit)}\n`);
  }
  for (const problem of run.quality.problems) process.stdout.write(`  retake: ${problem}\n`);
  return EXIT[run.verdict];
}

export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  try {
    if (command === 'run') return await runCommand(rest);
    if (command === 'validate') return await validateCommand(rest);
    throw new InvalidInput(command ? `unknown command "${command}"` : 'no command given');
  } catch (e) {
    if (e instanceof InvalidInput || e instanceof PhotoDecodeError || e instanceof RuleRunError || e instanceof KernelLibraryError) {
      process.stderr.write(`rule: ${e.message}\n`);
      if (e instanceof InvalidInput && /command|argument|required|needs a value|takes exactly/.test(e.message)) process.stderr.write(`${USAGE}\n`);
      return EXIT.INVALID;
    }
    process.stderr.write(`rule: unexpected failure: ${(e as Error).stack ?? e}\n`);
    return EXIT.ERROR;
  }
}

if (require.main === module) {
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
