/**
 * Tuning the demo plant's rules on a tuning set (its own seed, never the test's): prints, per family, the
 * quality figures of usable and unusable photos per frame size, every gauge's range on good photos and on
 * each defect kind, the confusion matrix of the chosen rule versions and the gauge values of each misjudged
 * photo. Run: npx ts-node --transpile-only -P server/tsconfig.json scripts/tune-demo-rules.ts
 *   [--seed 7001] [--per-family 60] [--sizes 640x480,1296x972] [--version released|inReview|inProgress]
 *
 * How the released limits were chosen (seed 7002, 150 photos per family, 640x480 and 1296x972, 8-bit):
 * - Focus overlaps: sensor noise, not edges, dominates the variance of the Laplacian, so a blurred 1296x972
 *   PNG (22-34) can score above a sharp 1296x972 JPEG (9-16). minFocus is the limit printed below that
 *   misjudges the fewest photos (bracket 10, washer 8.5, gasket 14). Dark retakes have a mean <= 17 and
 *   usable photos >= 56, clipped retakes >= 20 % clipped pixels and usable ones none: minMean 30, maxClipped 2 %.
 * - The LoG (sigma 2) of the part mask stays within 0.063..0.071 and -0.076..-0.069 on every good photo,
 *   whatever the size; a notch, line or crack lifts the maximum to >= 0.072, a lump or the sharp corners of
 *   a chip lower the minimum to <= -0.078. Limits: max 0.0715, min -0.078.
 * - Areas in mm²: bracket plate 1717.2..1718.4 good, >= 1730 with a missing or undersized hole; washer
 *   479.3..480.0 good, >= 531 with an undersized bore, <= 479.0 with most chips, >= 480.3 with most burrs.
 * - Gasket: the darkest smoothed rubber is >= 20 on good photos and <= 13.5 with a crack (min 16); a scuff
 *   is a third patch brighter than 41 grey levels (the board outside and inside the ring are the other two).
 */
import { FAMILY_NAMES, parseFrameSize, type FamilyName } from '../server/demo';
import { loadKernelLibrary } from '../server/vision/kernel-library';
import { DEMO_RULES, type FamilyRules } from '../server/seed/rules';
import { agreement, countVerdict, emptyConfusionMatrix, EXPECTED_VERDICT, formatConfusionMatrix, type ConfusionMatrix } from '../server/seed/rules/agreement';
import { judgeDemoPhotos, type JudgedPhoto } from '../server/seed/rules/judge-demo-photos';

function argument(name: string, fallback: string): string {
  const at = process.argv.indexOf(`--${name}`);
  return at >= 0 && process.argv[at + 1] ? process.argv[at + 1] : fallback;
}

const seed = Number(argument('seed', '7001'));
const perFamily = Number(argument('per-family', '60'));
const sizes = argument('sizes', '640x480,1296x972').split(',').map(parseFrameSize);
const version = argument('version', 'released') as keyof FamilyRules;

interface Range {
  min: number;
  max: number;
  n: number;
}
const widen = (range: Range | undefined, value: number): Range =>
  range ? { min: Math.min(range.min, value), max: Math.max(range.max, value), n: range.n + 1 } : { min: value, max: value, n: 1 };
const show = (r: Range) => `${r.min.toFixed(3)} .. ${r.max.toFixed(3)} (${r.n})`;

function groupOf(photo: JudgedPhoto): string {
  const { truth } = photo;
  if (truth.label === 'retake') return `retake:${truth.retakeReason}`;
  if (truth.label === 'good') return 'good';
  return `defective:${truth.defects.map((d) => d.kind).join('+')}`;
}

/** The limit between two neighbouring observed figures that leaves the fewest usable photos below and blurred ones at or above. */
function bestFocusLimit(figures: { focus: number; blurred: boolean }[]): { limit: number; errors: number } {
  const sorted = [...figures].sort((a, b) => a.focus - b.focus);
  let best = { limit: 0, errors: Infinity };
  for (let i = 0; i <= sorted.length; i++) {
    const limit = i === 0 ? 0 : i === sorted.length ? sorted[i - 1].focus + 1 : (sorted[i - 1].focus + sorted[i].focus) / 2;
    const errors = sorted.filter((f) => (f.blurred ? f.focus >= limit : f.focus < limit)).length;
    if (errors < best.errors) best = { limit, errors };
  }
  return best;
}

async function main(): Promise<void> {
  const kernels = await loadKernelLibrary();
  const rules = Object.fromEntries(FAMILY_NAMES.map((f) => [f, DEMO_RULES[f][version]]));
  const quality = new Map<string, Range>();
  const gauges = new Map<string, Range>();
  const matrices = new Map<FamilyName, ConfusionMatrix>(FAMILY_NAMES.map((f) => [f, emptyConfusionMatrix()]));
  const misjudged: string[] = [];
  const focusFigures = new Map<FamilyName, { focus: number; blurred: boolean }[]>(FAMILY_NAMES.map((f) => [f, []]));
  const options = { count: perFamily * FAMILY_NAMES.length, seed, sizes, sixteenBitShare: 0 };
  for await (const photo of judgeDemoPhotos(rules, options, kernels)) {
    const { truth, run } = photo;
    const group = groupOf(photo);
    const usable = truth.label === 'retake' ? group : 'usable';
    const format = truth.file.endsWith('.jpg') ? 'jpeg' : 'png';
    for (const figure of ['focus', 'mean', 'clipped'] as const) {
      const key = `${truth.family} ${truth.width} ${format} ${figure} ${usable}`;
      quality.set(key, widen(quality.get(key), run.quality[figure]));
    }
    if (truth.label !== 'retake') {
      for (const m of run.measurements) {
        const key = `${truth.family} ${m.name} ${truth.width} ${group}`;
        gauges.set(key, widen(gauges.get(key), m.value));
      }
    }
    if (truth.label !== 'retake' || truth.retakeReason === 'blur') {
      focusFigures.get(truth.family)!.push({ focus: run.quality.focus, blurred: truth.label === 'retake' });
    }
    countVerdict(matrices.get(truth.family)!, truth.label, run.verdict);
    if (run.verdict !== EXPECTED_VERDICT[truth.label]) {
      const values = run.measurements.map((m) => `${m.name}=${m.value.toFixed(3)}${m.pass ? '' : '!'}`).join(' ');
      const q = `focus=${run.quality.focus.toFixed(1)} mean=${run.quality.mean.toFixed(1)} clipped=${run.quality.clipped.toFixed(4)}`;
      misjudged.push(`${truth.file} ${truth.width} ${group} -> ${run.verdict}: ${q} ${values}`);
    }
  }
  console.log(`tuning set: seed ${seed}, ${perFamily} photos per family, ${sizes.map((s) => `${s.width}x${s.height}`).join(', ')}; ${version} rules`);
  console.log('\nquality figures (family, width, format, figure, photos):');
  for (const key of [...quality.keys()].sort()) console.log(`  ${key.padEnd(48)} ${show(quality.get(key)!)}`);
  console.log('\ngauge values (family, gauge, photos):');
  for (const key of [...gauges.keys()].sort()) console.log(`  ${key.padEnd(64)} ${show(gauges.get(key)!)}`);
  console.log('\nminimum focus that misjudges the fewest usable and blurred photos (the focus figures overlap):');
  for (const [family, figures] of focusFigures) {
    const best = bestFocusLimit(figures);
    console.log(`  ${family}: minFocus ${best.limit.toFixed(1)} misjudges ${best.errors} of ${figures.length}`);
  }
  for (const [family, matrix] of matrices) {
    console.log(`\n${family}: ${DEMO_RULES[family][version].name}, agreement ${(agreement(matrix) * 100).toFixed(1)} %`);
    console.log(formatConfusionMatrix(matrix));
  }
  console.log(`\nmisjudged (${misjudged.length}):`);
  for (const line of misjudged) console.log(`  ${line}`);
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
