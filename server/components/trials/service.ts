import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { listTrialResultsQuerySchema, startTrialRequestSchema, Sweep, Trial, TrialResult, TrialSummary } from '../../../shared/api/trials';
import { confusionTable, EXPECTED_VERDICT, trialFigures, type TruthLabel } from '../../../shared/metrics/agreement';
import { sweepLimit } from '../../../shared/metrics/sweep';
import type { RuleDocument } from '../../../shared/rules/schema';
import { RuleRunError } from '../../../shared/vision/pipeline';
import { AppError, notFound } from '../../lib/errors';
import type { ImageUrlSigner } from '../../lib/image-urls';
import type { JobQueue } from '../../lib/jobs';
import type { ImageStore } from '../../lib/storage/image-store';
import { decodePhoto } from '../../vision/decode';
import type { PipelineRunner } from '../../vision/runner';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { ReferenceImageEntity, ReferenceSetEntity } from '../references/entities';
import { RuleVersionEntity } from '../rules/entities';
import { StationEntity } from '../stations/entities';
import { TrialEntity, TrialResultEntity } from './entities';

export const TRIAL_QUEUE = 'trial.run';
/** Looks for trials whose worker stopped (every minute, on one worker; and when a worker starts). */
export const TRIAL_RESUME_QUEUE = 'trial.resume';
/** A trial taken up this many times without finishing is failed rather than tried for ever. */
export const MAX_TRIAL_ATTEMPTS = 5;

/**
 * The advisory lock that says "a worker is running this trial": PostgreSQL holds it for the
 * worker's connection and lets it go when that connection ends, so a worker that dies (killed, or
 * its machine lost) releases its trials without saying so. 64 bits of an MD5 of the id keep
 * different trials on different locks.
 */
const CLAIM_KEY = `('x' || substr(md5('kernwright.trial:' || $1), 1, 16))::bit(64)::bigint`;
/** Seconds after which PostgreSQL probes a silent worker's connection, the probes' spacing, and how many go unanswered before it ends it. */
const CLAIM_KEEPALIVE = { idle: 30, interval: 10, count: 3 };

interface TrialClaim {
  release(): Promise<void>;
}
type StartTrial = z.output<typeof startTrialRequestSchema>;
type ListResults = z.output<typeof listTrialResultsQuerySchema>;

interface StoredMeasurement {
  name: string;
  value: number;
  unit: string | null;
  limits: { min?: number; max?: number };
  pass: boolean;
}

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** A rule version run over every photo of a reference set, compared with the labels. */
export class TrialsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly signer: ImageUrlSigner,
    private readonly audit: AuditService,
    private readonly pool: PipelineRunner,
    private readonly jobs: JobQueue | null,
  ) {}

  private async toDto(trial: TrialEntity): Promise<Trial> {
    const set = await this.dataSource.getRepository(ReferenceSetEntity).findOneBy({ id: trial.referenceSetId });
    return {
      id: trial.id,
      ruleVersionId: trial.ruleVersionId,
      referenceSetId: trial.referenceSetId,
      referenceSetName: set?.name ?? '',
      contentHash: trial.contentHash,
      mmPerPx: trial.mmPerPx,
      state: trial.state,
      total: trial.total,
      processed: trial.processed,
      summary: trial.summary as TrialSummary | null,
      error: trial.error,
      startedBy: trial.startedBy,
      createdAt: trial.createdAt.toISOString(),
      finishedAt: trial.finishedAt?.toISOString() ?? null,
    };
  }

  async get(id: string): Promise<Trial> {
    const trial = await this.dataSource.getRepository(TrialEntity).findOneBy({ id });
    if (!trial) throw notFound('The trial');
    return this.toDto(trial);
  }

  async listForVersion(ruleVersionId: string): Promise<Trial[]> {
    const trials = await this.dataSource.getRepository(TrialEntity).find({ where: { ruleVersionId }, order: { createdAt: 'DESC' }, take: 50 });
    return Promise.all(trials.map((t) => this.toDto(t)));
  }

  /** Records a queued trial and hands it to the background queue (or runs it here when there is none). */
  async start(actor: UserEntity, input: StartTrial): Promise<Trial> {
    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneBy({ id: input.ruleVersionId });
    if (!version) throw notFound('The rule version');
    const set = await this.dataSource.getRepository(ReferenceSetEntity).findOneBy({ id: input.referenceSetId });
    if (!set) throw notFound('The reference set');
    let mmPerPx: number | null = null;
    if (input.stationId) {
      const station = await this.dataSource.getRepository(StationEntity).findOneBy({ id: input.stationId });
      if (!station) throw notFound('The station');
      if (station.mmPerPx === null) throw new AppError('conflict', `${station.name} is not calibrated; calibrate it or choose another station`);
      mmPerPx = station.mmPerPx;
    }
    const total = await this.dataSource.getRepository(ReferenceImageEntity).countBy({ setId: set.id });
    if (total === 0) throw new AppError('conflict', `${set.name} has no photos yet; upload some first`);
    const trial = await this.dataSource.transaction(async (manager) => {
      const saved = await manager.save(
        manager.create(TrialEntity, { ruleVersionId: version.id, referenceSetId: set.id, contentHash: version.contentHash, mmPerPx, state: 'queued', total, processed: 0, startedBy: actor.id }),
      );
      await this.audit.record(manager, { actor: actorOf(actor), action: 'trial.start', entityType: 'trial', entityId: saved.id, details: { ruleVersionId: version.id, referenceSet: set.name, total } });
      return saved;
    });
    if (this.jobs) await this.jobs.send(TRIAL_QUEUE, { trialId: trial.id }, { singletonKey: trial.id });
    else await this.run(trial.id);
    return this.get(trial.id);
  }

  /** Claims the trial for this worker, or answers null when another live worker holds it. */
  private async claim(trialId: string): Promise<TrialClaim | null> {
    const connection = this.dataSource.createQueryRunner();
    await connection.connect();
    try {
      // A machine that vanishes sends no goodbye: keepalive probes let PostgreSQL end its connection, and so its claims, within about a minute.
      await connection.query(`set tcp_keepalives_idle = ${CLAIM_KEEPALIVE.idle}; set tcp_keepalives_interval = ${CLAIM_KEEPALIVE.interval}; set tcp_keepalives_count = ${CLAIM_KEEPALIVE.count}`);
      const [{ claimed }] = await connection.query(`select pg_try_advisory_lock(${CLAIM_KEY}) as claimed`, [trialId]);
      if (!claimed) {
        await connection.release();
        return null;
      }
    } catch (err) {
      await connection.release();
      throw err;
    }
    return {
      async release() {
        try {
          await connection.query(`select pg_advisory_unlock(${CLAIM_KEY})`, [trialId]);
        } finally {
          await connection.release();
        }
      },
    };
  }

  /**
   * Runs (or resumes) a trial: every photo of the set not yet judged is run through the pool and its
   * result stored once (the primary key makes a retried job count each photo once). While it runs,
   * the worker holds the trial's claim, so a second job for the same trial (a retry, a resume) leaves
   * it alone, and a worker that dies lets it go for resumeAbandoned() to hand on.
   */
  async run(trialId: string): Promise<void> {
    const claim = await this.claim(trialId);
    if (!claim) return;
    try {
      await this.runClaimed(trialId);
    } finally {
      await claim.release();
    }
  }

  /**
   * Sends every trial that is marked running but claimed by no worker (its worker was killed, or its
   * machine lost) back to the queue, where the next free worker resumes it. Answers how many.
   */
  async resumeAbandoned(): Promise<number> {
    if (!this.jobs) return 0;
    const running: { id: string }[] = await this.dataSource.query(`select id from trials where state = 'running' order by created_at`);
    let resumed = 0;
    for (const { id } of running) {
      const claim = await this.claim(id);
      if (!claim) continue;
      await claim.release();
      await this.jobs.send(TRIAL_QUEUE, { trialId: id });
      resumed += 1;
    }
    return resumed;
  }

  private async runClaimed(trialId: string): Promise<void> {
    const repo = this.dataSource.getRepository(TrialEntity);
    const trial = await repo.findOneBy({ id: trialId });
    if (!trial || trial.state === 'done' || trial.state === 'failed') return;
    if (trial.attempts >= MAX_TRIAL_ATTEMPTS) {
      const error = `The trial stopped ${trial.attempts} times before it finished (its worker failed or was stopped each time); start a new trial`;
      await repo.update({ id: trialId }, { state: 'failed', error, finishedAt: new Date() });
      return;
    }
    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneByOrFail({ id: trial.ruleVersionId });
    if (version.contentHash !== trial.contentHash && version.state === 'draft') {
      // The draft changed while the trial waited: run the content the trial was started for is gone.
      await repo.update({ id: trialId }, { state: 'failed', error: 'The draft was edited before the trial ran; start a new trial', finishedAt: new Date() });
      return;
    }
    trial.attempts += 1;
    await repo.update({ id: trialId }, { state: 'running', attempts: trial.attempts });
    const images = await this.dataSource.getRepository(ReferenceImageEntity).find({ where: { setId: trial.referenceSetId }, order: { createdAt: 'ASC', id: 'ASC' } });
    const done = new Set<string>((await this.dataSource.query('select image_id from trial_results where trial_id = $1', [trialId])).map((r: { image_id: string }) => r.image_id));
    try {
      for (const image of images) {
        if (done.has(image.id)) continue;
        await this.judge(trial, version.document, image);
        await this.dataSource.query('update trials set processed = (select count(*) from trial_results where trial_id = $1) where id = $1', [trialId]);
      }
    } catch (err) {
      if (err instanceof RuleRunError) {
        await repo.update({ id: trialId }, { state: 'failed', error: err.message, finishedAt: new Date() });
        return;
      }
      throw err;
    }
    const summary = await this.summarise(trialId);
    Object.assign(trial, { state: 'done', summary, finishedAt: new Date(), total: images.length, processed: images.length });
    await repo.save(trial);
  }

  private async judge(trial: TrialEntity, document: RuleDocument, image: ReferenceImageEntity): Promise<void> {
    const started = performance.now();
    const photo = await decodePhoto(await this.store.get(image.contentHash));
    const run = await this.pool.run(document, photo, { mmPerPx: trial.mmPerPx ?? undefined, retain: 'gauged', images: 'none', transferPhoto: true });
    const durationMs = performance.now() - started;
    const measurements: StoredMeasurement[] = run.measurements.map((m) => ({ name: m.name, value: m.value, unit: m.unit, limits: m.limits, pass: m.pass }));
    const labelled = image.label !== 'unlabelled';
    const agrees = labelled ? EXPECTED_VERDICT[image.label as TruthLabel] === run.verdict : null;
    await this.dataSource.query(
      `insert into trial_results (trial_id, image_id, verdict, label, agrees, measurements, quality, duration_ms)
       values ($1, $2, $3, $4, $5, $6, $7, $8) on conflict do nothing`,
      [trial.id, image.id, run.verdict, image.label, agrees, JSON.stringify(measurements), JSON.stringify(run.quality), durationMs],
    );
  }

  private async summarise(trialId: string): Promise<TrialSummary> {
    const rows = await this.dataSource.getRepository(TrialResultEntity).findBy({ trialId });
    const labelled = rows.filter((r) => r.label !== 'unlabelled');
    const figures = trialFigures(confusionTable(labelled.map((r) => ({ label: r.label as TruthLabel, verdict: r.verdict }))));
    return { ...figures, unlabelled: rows.length - labelled.length, medianMs: median(rows.map((r) => r.durationMs)) };
  }

  async results(trialId: string, query: ListResults): Promise<{ items: TrialResult[]; total: number }> {
    await this.get(trialId);
    const qb = this.dataSource
      .getRepository(TrialResultEntity)
      .createQueryBuilder('r')
      .innerJoinAndSelect('r.image', 'i')
      .where('r.trial_id = :trialId', { trialId });
    if (query.outcome === 'misjudged') qb.andWhere('r.agrees = false');
    if (query.outcome === 'agrees') qb.andWhere('r.agrees = true');
    qb.orderBy(query.sort === 'slowest' ? 'r.duration_ms' : 'i.file_name', query.sort === 'slowest' ? 'DESC' : 'ASC');
    const [rows, total] = await qb.take(query.limit).skip(query.offset).getManyAndCount();
    return {
      total,
      items: rows.map((r) => ({
        imageId: r.imageId,
        fileName: r.image!.fileName,
        thumbnailUrl: r.image!.thumbnailHash ? this.signer.url(r.image!.thumbnailHash) : null,
        label: r.label,
        defectKind: r.image!.defectKind,
        verdict: r.verdict,
        agrees: r.agrees,
        measurements: r.measurements as StoredMeasurement[],
        quality: r.quality,
        durationMs: r.durationMs,
      })),
    };
  }

  /** False reject rate against escape rate for every candidate limit of one gauge. */
  async sweep(trialId: string, gauge: string, bound: 'min' | 'max'): Promise<Sweep> {
    const trial = await this.dataSource.getRepository(TrialEntity).findOneBy({ id: trialId });
    if (!trial) throw notFound('The trial');
    if (trial.state !== 'done') throw new AppError('conflict', 'The trial has not finished yet');
    const rows = await this.dataSource.getRepository(TrialResultEntity).findBy({ trialId });
    const inputs = rows.flatMap((r) => {
      const ms = r.measurements as StoredMeasurement[];
      const swept = ms.find((m) => m.name === gauge);
      if (!swept || r.label === 'unlabelled') return [];
      return [{ label: r.label as TruthLabel, retake: r.verdict === 'RETAKE', value: swept.value, othersPass: ms.every((m) => m.name === gauge || m.pass) }];
    });
    if (inputs.length === 0 && rows.length > 0) throw new AppError('validation_failed', `gauge: the rule has no gauge named "${gauge}"`, { issues: [{ path: 'gauge', message: 'No such gauge' }] });
    const current = (rows[0]?.measurements as StoredMeasurement[] | undefined)?.find((m) => m.name === gauge)?.limits[bound] ?? null;
    return { gauge, bound, current, points: sweepLimit(inputs, bound) };
  }
}
