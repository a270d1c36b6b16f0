// The demo plant, Fernwick Parts Works: part types, two lines with four calibrated stations (each inspecting one part type),
// reference sets of generated photos, rules tried on them and released by a second person, and
// weeks of inspection history made by running the released rules on generated photos. Every step
// goes through the same services as the app, and skips what already exists (idempotent).
import type { DataSource } from 'typeorm';
import { FAMILY_NAMES, PART_FAMILIES, generateDataset, type FamilyName } from '../demo';
import type { RuleDocument } from '../../shared/rules/schema';
import { UserEntity } from '../components/auth/entities';
import { DefectKindEntity, PartTypeEntity } from '../components/catalogue/entities';
import { InspectionEntity } from '../components/inspections/entities';
import { ensureInspectionMonths } from '../components/inspections/partitions';
import { ReferenceSetEntity } from '../components/references/entities';
import { RuleEntity } from '../components/rules/entities';
import { LineEntity, StationEntity } from '../components/stations/entities';
import type { Services } from '../services';
import { DEMO_PASSWORD } from './demo-users';
import { DEMO_RULES } from './rules';

/** Every seeded photo is taken at this frame, so one calibration per station holds for all of them. */
export const DEMO_FRAME = { width: 640, height: 480 } as const;

export interface DemoPlantOptions {
  seed?: number;
  /** Photos per reference set (about one third defective). */
  referencePhotos?: number;
  /** Days of inspection history, ending today. */
  historyDays?: number;
  /** Inspections per station and day. */
  perStationPerDay?: number;
  log?: (line: string) => void;
}

const PART_TYPE_NAMES: Record<FamilyName, string> = {
  bracket: 'Stamped bracket 60×30',
  washer: 'Machined washer M16',
  gasket: 'Moulded gasket ring 50/38',
};

const DEFECT_KINDS: { code: string; name: string }[] = [
  { code: 'scratch', name: 'Scratch' },
  { code: 'crack', name: 'Crack' },
  { code: 'chip', name: 'Chip or notch' },
  { code: 'burr', name: 'Burr' },
  { code: 'missing-hole', name: 'Missing hole' },
  { code: 'undersized-hole', name: 'Undersized hole' },
];

/** Two lines, four stations; which family each station photographs; the one whose process drifts. */
const LINES = [
  {
    name: 'Line 1 — stamping',
    stations: [
      { name: 'Press 3 exit', family: 'bracket' as FamilyName, cameraNote: '5 MP mono camera, 25 mm lens, ring light; photos at 640×480', drifts: false },
      { name: 'Deburr cell', family: 'bracket' as FamilyName, cameraNote: '5 MP mono camera over the deburr belt; photos at 640×480', drifts: true },
    ],
  },
  {
    name: 'Line 2 — machining and moulding',
    stations: [
      { name: 'Lathe 7 exit', family: 'washer' as FamilyName, cameraNote: 'Colour camera, telecentric lens; photos at 640×480', drifts: false },
      { name: 'Moulding press 2', family: 'gasket' as FamilyName, cameraNote: 'Colour camera under a diffuse dome; photos at 640×480', drifts: false },
    ],
  },
];

const RULE_NAMES: Record<FamilyName, string> = {
  bracket: 'Bracket hole and edge check',
  washer: 'Washer rim and bore check',
  gasket: 'Gasket ring defects',
};

export function partTypeCode(family: FamilyName): string {
  return PART_FAMILIES[family].partType.toLowerCase();
}

/** mm per pixel of the demo frame for a family: the generator's field of view across the frame width. */
export function demoScale(family: FamilyName): number {
  return PART_FAMILIES[family].fieldOfViewMm / DEMO_FRAME.width;
}

async function person(dataSource: DataSource, username: string): Promise<UserEntity> {
  return dataSource.getRepository(UserEntity).findOneByOrFail({ username });
}

/** A small deterministic random source for choosing photos and times (Mulberry32, T. Ettinger, public domain). */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function runWithConcurrency<T>(items: T[], limit: number, work: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  await Promise.all(
    Array.from({ length: limit }, async () => {
      while (next < items.length) await work(items[next++]);
    }),
  );
}

export async function seedDemoPlant(services: Services, options: DemoPlantOptions = {}): Promise<void> {
  const seed = options.seed ?? 2026;
  const started = Date.now();
  const log = (line: string) => options.log?.(`${line} (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  const ds = services.dataSource;
  const engineer = await person(ds, 'engineer');
  const supervisor = await person(ds, 'supervisor');
  const operator = await person(ds, 'operator');

  // Part types and defect kinds.
  for (const family of FAMILY_NAMES) await ds.getRepository(PartTypeEntity).upsert({ code: partTypeCode(family), name: PART_TYPE_NAMES[family], family }, ['code']);
  await ds.getRepository(DefectKindEntity).upsert(DEFECT_KINDS, ['code']);

  // Lines and stations, each inspecting its family's part type, calibrated from a 20 mm gauge block photographed at each station.
  const stations: { id: string; family: FamilyName; drifts: boolean; name: string }[] = [];
  for (const line of LINES) {
    const lineId = (await ds.getRepository(LineEntity).findOneBy({ name: line.name }))?.id ?? (await services.stations.createLine(supervisor, { name: line.name })).id;
    for (const s of line.stations) {
      let station = await ds.getRepository(StationEntity).findOneBy({ lineId, name: s.name });
      if (!station) {
        const created = await services.stations.createStation(supervisor, { lineId, name: s.name, cameraNote: s.cameraNote, partTypes: [partTypeCode(s.family)] });
        // The scale holds for the demo frame, the size every seeded photo is generated at (generateDataset's sizes below).
        await services.stations.calibrate(supervisor, created.id, { referenceLengthMm: 20, distancePx: 20 / demoScale(s.family), photoWidthPx: DEMO_FRAME.width, photoHeightPx: DEMO_FRAME.height });
        station = await ds.getRepository(StationEntity).findOneByOrFail({ id: created.id });
      }
      stations.push({ id: station.id, family: s.family, drifts: s.drifts, name: s.name });
    }
  }
  log(`stations: ${stations.length}`);

  // Reference sets: generated photos uploaded through the same path as the engineers' uploads.
  const referencePhotos = options.referencePhotos ?? 60;
  const sets = new Map<FamilyName, string>();
  for (const [i, family] of FAMILY_NAMES.entries()) {
    const name = `${PART_TYPE_NAMES[family]} — reference photos`;
    const existing = await ds.getRepository(ReferenceSetEntity).findOneBy({ name });
    const set = existing ?? (await services.references.createSet(engineer, { name, partType: partTypeCode(family), description: `Labelled demo photos of the ${family} at ${DEMO_FRAME.width}×${DEMO_FRAME.height}, about one third defective.` }));
    sets.set(family, set.id);
    if (existing) continue;
    let n = 0;
    for await (const photo of generateDataset({ count: referencePhotos, seed: seed + i, families: [family], sizes: [DEMO_FRAME], defectShare: 1 / 3, retakeShare: 0.1 })) {
      await services.references.addImages(engineer, set.id, [{ fileName: photo.fileName, bytes: photo.buffer }], {
        label: photo.truth.label,
        defectKind: photo.truth.label === 'defective' ? (photo.truth.defects[0]?.kind ?? null) : null,
        note: photo.truth.retakeReason ? `Unusable on purpose: ${photo.truth.retakeReason}` : '',
      });
      n += 1;
    }
    log(`reference set ${family}: ${n} photos`);
  }

  // Rules: each family's rule is drafted, tried on its reference set at its station's calibration,
  // submitted by the engineer and released by the supervisor.
  const released = new Map<FamilyName, string>();
  for (const family of FAMILY_NAMES) {
    const name = RULE_NAMES[family];
    const station = stations.find((s) => s.family === family)!;
    const existing = await ds.getRepository(RuleEntity).findOneBy({ name });
    if (existing) {
      const detail = await services.rules.detail(existing.id);
      if (detail.releasedVersion) released.set(family, detail.releasedVersion.id);
      continue;
    }
    const rule = await services.rules.create(engineer, { name, partType: partTypeCode(family), smallestDefectMm: 0.3, document: DEMO_RULES[family].released });
    const v1 = rule.versions[0].id;
    const trial = await services.trials.start(engineer, { ruleVersionId: v1, referenceSetId: sets.get(family)!, stationId: station.id });
    await services.rules.submit(engineer, v1, `Agreement on the reference set: ${trial.summary?.agreement.count}/${trial.summary?.agreement.of}`);
    await services.rules.release(supervisor, v1, { password: DEMO_PASSWORD, meaning: 'approval', note: 'Trial reviewed; limits follow the part drawing.' });
    released.set(family, v1);
    log(`rule ${name}: released after a trial (agreement ${trial.summary?.agreement.count}/${trial.summary?.agreement.of})`);

    // A newer version under way: in review for the washer, in progress for the bracket.
    const next: { doc: RuleDocument; submit: boolean } | null =
      family === 'washer' ? { doc: DEMO_RULES.washer.inReview, submit: true } : family === 'bracket' ? { doc: DEMO_RULES.bracket.inProgress, submit: false } : null;
    if (next) {
      const draft = await services.rules.newDraft(engineer, rule.id);
      await services.rules.saveDraft(engineer, draft.id, next.doc, next.submit ? 'Tighter limit after the March complaint' : 'Trying a second clean-up step');
      if (next.submit) {
        await services.trials.start(engineer, { ruleVersionId: draft.id, referenceSetId: sets.get(family)!, stationId: station.id });
        await services.rules.submit(engineer, draft.id, 'Tighter limit after the March complaint');
      }
    }
  }

  // History: weeks of inspections at every station, two shifts a day; the deburr cell drifts in the last week.
  if ((await ds.getRepository(InspectionEntity).count()) > 0) return;
  const days = options.historyDays ?? 30;
  const perDay = options.perStationPerDay ?? 25;
  const random = mulberry32(seed ^ 0x5eed);
  // Per family, a pool of generated photos (half defective); each inspection draws a good or a
  // defective photo at the station's defect rate, so the same photos serve every day.
  const pools = new Map<FamilyName, { good: Buffer[]; defective: Buffer[]; retake: Buffer[] }>();
  for (const [fi, family] of FAMILY_NAMES.entries()) {
    const pool = { good: [] as Buffer[], defective: [] as Buffer[], retake: [] as Buffer[] };
    for await (const p of generateDataset({ count: 36, seed: seed + 100 + fi, families: [family], sizes: [DEMO_FRAME], defectShare: 0.45, retakeShare: 0.1 })) pool[p.truth.label].push(p.buffer);
    pools.set(family, pool);
  }
  log('history photos generated');
  const pick = <T>(items: T[]) => items[Math.floor(random() * items.length)];
  const jobs: { station: (typeof stations)[number]; at: Date; photo: Buffer; key: string }[] = [];
  const today = new Date();
  today.setUTCHours(0, 0, 0, 0);
  for (const [si, station] of stations.entries()) {
    for (let d = days - 1; d >= 0; d--) {
      const drifting = station.drifts && d < 7;
      const defectRate = drifting ? 0.12 + 0.04 * (7 - d) : 0.05;
      const pool = pools.get(station.family)!;
      for (let k = 0; k < perDay; k++) {
        const r = random();
        const photo = r < 0.02 ? pick(pool.retake) : r < 0.02 + defectRate ? pick(pool.defective) : pick(pool.good);
        const at = new Date(today.getTime() - d * 86_400_000 + (6 + random() * 16) * 3_600_000);
        if (at.getTime() > Date.now()) at.setTime(Date.now() - random() * 3_600_000);
        jobs.push({ station, at, photo, key: `demo-${seed}-${si}-${d}-${k}` });
      }
    }
  }
  // The history's months get their partitions first, so that its rows do not land in DEFAULT.
  await ensureInspectionMonths(ds, new Date(today.getTime() - days * 86_400_000), today);
  let done = 0;
  await runWithConcurrency(jobs, 4, async (job) => {
    await services.inspections.inspect(operator, { stationId: job.station.id, ruleVersionId: released.get(job.station.family)!, idempotencyKey: job.key }, job.photo, { at: job.at });
    done += 1;
    if (done % 500 === 0) log(`history: ${done}/${jobs.length} inspections`);
  });
  log(`history: ${jobs.length} inspections over ${days} days`);

  // The alert check once, as the background job would: the drifting deburr cell raises its alerts.
  const check = await services.alerts.check();
  log(`alerts: ${check.raised} raised over ${check.series} rule and station series`);
}
