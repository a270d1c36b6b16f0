/** Deciding, from the options and the seed alone, what every photo of a demo set shows. */
import { planDefect } from './defects';
import { FAMILY_NAMES, PART_FAMILIES } from './families';
import { planNuisance, planPose } from './nuisance';
import { createRandom, deriveSeed, shuffle, type Random } from './random';
import type { BitDepth, Defect, DefectKind, FamilyName, ImageFormat, Label, PartSpec, RetakeReason } from './types';

export interface FrameSize {
  width: number;
  height: number;
}

export interface DatasetOptions {
  count: number;
  seed: number;
  families?: readonly FamilyName[];
  sizes?: readonly FrameSize[];
  /** Share of photos made unusable on purpose (label "retake"); default 0.1. */
  retakeShare?: number;
  /** Share of photos showing a defective part; default one third. */
  defectShare?: number;
  /** Share of colour photos (the rest are greyscale); default 0.3. */
  colourShare?: number;
  /** Share of 16-bit PNGs; default 0.15. */
  sixteenBitShare?: number;
  /** Share of 8-bit photos encoded as JPEG instead of PNG; default 0.2. */
  jpegShare?: number;
}

export interface ImagePlan {
  index: number;
  fileName: string;
  label: Label;
  retakeReason?: RetakeReason;
  format: ImageFormat;
  bitDepth: BitDepth;
  spec: PartSpec;
}

/** Camera frames from VGA to 5 MP, all 4:3. */
export const STANDARD_SIZES: readonly FrameSize[] = [
  { width: 640, height: 480 },
  { width: 1024, height: 768 },
  { width: 1296, height: 972 },
  { width: 1600, height: 1200 },
  { width: 2048, height: 1536 },
  { width: 2592, height: 1944 },
];
export const MIN_WIDTH = 320;
export const MAX_WIDTH = 4096;
export const MAX_COUNT = 100000;
export const RETAKE_REASONS: readonly RetakeReason[] = ['blur', 'dark', 'clipped'];
const SECOND_DEFECT_SHARE = 0.2;
const SECOND_DEFECT_KINDS: readonly DefectKind[] = ['scratch', 'chip', 'burr', 'crack'];

/** Parses "WIDTHxHEIGHT" (e.g. "1296x972"). */
export function parseFrameSize(text: string): FrameSize {
  const match = /^(\d+)x(\d+)$/.exec(text.trim());
  if (!match) throw new Error(`Expected a frame size like 1296x972 but received "${text}"`);
  const size = { width: Number(match[1]), height: Number(match[2]) };
  checkFrameSize(size);
  return size;
}

export function checkFrameSize({ width, height }: FrameSize): void {
  if (!Number.isInteger(width) || width < MIN_WIDTH || width > MAX_WIDTH) {
    throw new Error(`Expected a frame width between ${MIN_WIDTH} and ${MAX_WIDTH} but received ${width}`);
  }
  if (width * 3 !== height * 4) {
    throw new Error(`Expected a 4:3 frame (the stations' cameras) but received ${width}x${height}`);
  }
}

function checkShare(name: string, value: number): number {
  if (!Number.isFinite(value) || value < 0 || value > 1) {
    throw new Error(`Expected a number between 0 and 1 for ${name} but received ${value}`);
  }
  return value;
}

interface ResolvedOptions {
  count: number;
  seed: number;
  families: readonly FamilyName[];
  sizes: readonly FrameSize[];
  retakeShare: number;
  defectShare: number;
  colourShare: number;
  sixteenBitShare: number;
  jpegShare: number;
}

export function resolveOptions(options: DatasetOptions): ResolvedOptions {
  if (!Number.isInteger(options.count) || options.count < 1 || options.count > MAX_COUNT) {
    throw new Error(`Expected a whole number between 1 and ${MAX_COUNT} for count but received ${options.count}`);
  }
  if (!Number.isInteger(options.seed) || options.seed < 0 || options.seed > 0xffffffff) {
    throw new Error(`Expected a whole number between 0 and 4294967295 for seed but received ${options.seed}`);
  }
  const families = options.families ?? FAMILY_NAMES;
  if (families.length === 0) throw new Error('Expected at least one part family');
  for (const family of families) {
    if (!(family in PART_FAMILIES)) {
      throw new Error(`Unknown part family "${family}"; expected one of ${FAMILY_NAMES.join(', ')}`);
    }
  }
  const sizes = options.sizes ?? STANDARD_SIZES;
  if (sizes.length === 0) throw new Error('Expected at least one frame size');
  sizes.forEach(checkFrameSize);
  const retakeShare = checkShare('retakeShare', options.retakeShare ?? 0.1);
  const defectShare = checkShare('defectShare', options.defectShare ?? 1 / 3);
  if (retakeShare + defectShare > 1) {
    throw new Error(`retakeShare + defectShare must not exceed 1 but is ${retakeShare + defectShare}`);
  }
  return {
    count: options.count,
    seed: options.seed,
    families,
    sizes,
    retakeShare,
    defectShare,
    colourShare: checkShare('colourShare', options.colourShare ?? 0.3),
    sixteenBitShare: checkShare('sixteenBitShare', options.sixteenBitShare ?? 0.15),
    jpegShare: checkShare('jpegShare', options.jpegShare ?? 0.2),
  };
}

/**
 * Plans every photo. Families take turns; within each family exact quotas of retakes and defective
 * parts are shuffled into place, retake reasons and defect kinds take turns so that all appear.
 */
export function planDataset(options: DatasetOptions): ImagePlan[] {
  const resolved = resolveOptions(options);
  const { count, seed, families } = resolved;
  const plans: ImagePlan[] = [];
  const perFamily = families.map((_, f) => Math.floor(count / families.length) + (f < count % families.length ? 1 : 0));
  const labels = perFamily.map((n, f) => familyLabels(n, resolved, createRandom(deriveSeed(seed, 0x1abe1, f))));
  const kindTurn = families.map((_, f) => deriveSeed(seed, 0x0defec7, f) % PART_FAMILIES[families[f]].defectKinds.length);
  const retakeTurn = families.map(() => 0);
  for (let index = 0; index < count; index++) {
    const f = index % families.length;
    const label = labels[f][Math.floor(index / families.length)];
    const random = createRandom(deriveSeed(seed, index));
    const family = PART_FAMILIES[families[f]];
    let retakeReason: RetakeReason | undefined;
    let kinds: DefectKind[] = [];
    if (label === 'retake') retakeReason = RETAKE_REASONS[retakeTurn[f]++ % RETAKE_REASONS.length];
    if (label === 'defective') {
      kinds = [family.defectKinds[kindTurn[f]++ % family.defectKinds.length]];
      if (random.chance(SECOND_DEFECT_SHARE)) {
        kinds.push(random.pick(SECOND_DEFECT_KINDS.filter((kind) => kind !== kinds[0])));
      }
    }
    plans.push(planImage(index, family.name, label, retakeReason, kinds, resolved, random));
  }
  return plans;
}

function familyLabels(n: number, options: ResolvedOptions, random: Random): Label[] {
  const retakes = Math.round(n * options.retakeShare);
  const defective = Math.min(n - retakes, Math.round(n * options.defectShare));
  const labels: Label[] = [
    ...Array<Label>(retakes).fill('retake'),
    ...Array<Label>(defective).fill('defective'),
    ...Array<Label>(n - retakes - defective).fill('good'),
  ];
  return shuffle(labels, random);
}

function planImage(
  index: number,
  familyName: FamilyName,
  label: Label,
  retakeReason: RetakeReason | undefined,
  kinds: DefectKind[],
  options: ResolvedOptions,
  random: Random,
): ImagePlan {
  const family = PART_FAMILIES[familyName];
  const { width, height } = random.pick(options.sizes);
  const colour = random.chance(options.colourShare);
  const bitDepth: BitDepth = random.chance(options.sixteenBitShare) ? 16 : 8;
  const format: ImageFormat = bitDepth === 8 && random.chance(options.jpegShare) ? 'jpeg' : 'png';
  const mmPerPx = family.fieldOfViewMm / width;
  const pose = planPose(width, height, random);
  const nuisance = planNuisance(width, random, retakeReason);
  const defects: Defect[] = kinds.map((kind) => planDefect(kind, family, mmPerPx, random));
  const fileName = `${String(index + 1).padStart(4, '0')}-${familyName}.${format === 'jpeg' ? 'jpg' : 'png'}`;
  const spec: PartSpec = { family: familyName, width, height, colour, mmPerPx, pose, nuisance, defects };
  return { index, fileName, label, retakeReason, format, bitDepth, spec };
}
