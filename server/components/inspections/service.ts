import crypto from 'node:crypto';
import { IsNull, Not, type DataSource } from 'typeorm';
import type { z } from 'zod';
import type { Inspection, inspectRequestSchema } from '../../../shared/api/inspections';
import type { Measurement, RuleRun, Verdict } from '../../../shared/vision/pipeline';
import { AppError, notFound } from '../../lib/errors';
import type { ImageUrlSigner } from '../../lib/image-urls';
import type { ImageStore } from '../../lib/storage/image-store';
import type { DecodedPhoto } from '../../vision/decode';
import { decodeUploadedPhoto } from '../../vision/decode-upload';
import { evidencePngOf } from '../../vision/encode';
import type { EvidenceRaster } from '../../vision/evidence';
import type { PipelineRunner } from '../../vision/runner';
import type { AuditService } from '../audit/service';
import { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { RuleEntity, RuleVersionEntity } from '../rules/entities';
import { LineEntity, StationEntity } from '../stations/entities';
import { requireStationInspects } from '../stations/part-types';
import { DisputeEntity, InspectionEntity, MeasurementEntity } from './entities';
import { wrongSizeQuality } from './photo-size';

type InspectRequest = z.output<typeof inspectRequestSchema>;

export interface InspectOptions {
  /** When the inspection happened; only the demo seed sets it (history), the API always uses now. */
  at?: Date;
  /** Skip the evidence image (the seed's history). */
  evidence?: boolean;
}

/** Where one inspection's time went, in ms, phase by phase (the route sends it as Server-Timing). */
export interface InspectTimings {
  /** Idempotency check, rule version, station, line and rule looked up. */
  lookup?: number;
  decode?: number;
  /** Handing the photo to a worker, waiting for one, running the rule and receiving the result. */
  pipeline?: number;
  /** The engine's own time inside the worker (channel, quality gate, steps, gauges). */
  engine?: number;
  /** Each step's time inside the engine, in order. */
  steps?: { op: string; ms: number }[];
  /** Writing the photo into the image store. */
  store?: number;
  /** Drawing and storing the evidence image (FAIL only). */
  evidence?: number;
  /** The transaction: inspection, measurements, audit event. */
  database?: number;
  /** Reading the stored inspection back for the answer. */
  reply?: number;
}

/** Elapsed ms since the previous lap, recorded under the phase's name. */
function phaseClock(timings: InspectTimings): (phase: 'lookup' | 'decode' | 'pipeline' | 'store' | 'evidence' | 'database' | 'reply') => void {
  let last = performance.now();
  return (phase) => {
    const now = performance.now();
    timings[phase] = now - last;
    last = now;
  };
}

/** The first failing gauge, or the quality figure that asked for a retake. */
export function causeOf(run: { verdict: Verdict; quality: { problems: readonly string[] }; measurements: readonly Pick<Measurement, 'name' | 'pass'>[] }): string | null {
  if (run.verdict === 'RETAKE') return run.quality.problems[0]?.split(':')[0] ?? 'photo quality';
  return run.measurements.find((m) => !m.pass)?.name ?? null;
}

/** What an inspection stores of its judgement: from the rule's run, or a retake before it. */
interface Judgement {
  verdict: Verdict;
  cause: string | null;
  quality: Record<string, unknown>;
  measurements: readonly Measurement[];
  evidenceHash: string | null;
}

/** A retake decided before the rule runs: nothing measured, no evidence, the problem as its cause. */
function unmeasuredRetake(quality: { problems: string[] }): Judgement {
  return { verdict: 'RETAKE', cause: causeOf({ verdict: 'RETAKE', quality, measurements: [] }), quality, measurements: [], evidenceHash: null };
}

export class InspectionsService {
  /** One evidence image per run (a run handed out twice, as the seed's memoizing runner does, is drawn once). */
  private readonly evidence = new WeakMap<RuleRun, Promise<Buffer>>();

  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly signer: ImageUrlSigner,
    private readonly audit: AuditService,
    private readonly pool: PipelineRunner,
  ) {}

  async get(id: string): Promise<Inspection> {
    const inspection = await this.dataSource.getRepository(InspectionEntity).findOneBy({ id });
    if (!inspection) throw notFound('The inspection');
    return this.toDto(inspection);
  }

  private async toDto(i: InspectionEntity): Promise<Inspection> {
    const [version, station, operator, measurements, dispute] = await Promise.all([
      this.dataSource.getRepository(RuleVersionEntity).findOneByOrFail({ id: i.ruleVersionId }),
      this.dataSource.getRepository(StationEntity).findOneOrFail({ where: { id: i.stationId }, relations: { line: true } }),
      this.dataSource.getRepository(UserEntity).findOneByOrFail({ id: i.operatorId }),
      this.dataSource.getRepository(MeasurementEntity).find({ where: { inspectionId: i.id }, order: { position: 'ASC' } }),
      this.dataSource.getRepository(DisputeEntity).findOneBy({ inspectionId: i.id }),
    ]);
    const rule = await this.dataSource.getRepository(RuleEntity).findOneByOrFail({ id: i.ruleId });
    return {
      id: i.id,
      idempotencyKey: i.idempotencyKey,
      ruleId: i.ruleId,
      ruleName: rule.name,
      ruleVersionId: i.ruleVersionId,
      ruleVersionNumber: version.number,
      stationId: i.stationId,
      stationName: station.name,
      lineName: station.line!.name,
      partType: i.partType,
      operator: { id: operator.id, name: operator.displayName },
      verdict: i.verdict,
      cause: i.cause,
      quality: i.quality,
      measurements: measurements.map((m) => ({ gauge: m.gauge, value: m.value, unit: m.unit, limitMin: m.limitMin, limitMax: m.limitMax, pass: m.pass })),
      mmPerPx: i.mmPerPx,
      durationMs: i.durationMs,
      imageUrl: this.signer.url(i.imageHash),
      evidenceUrl: i.evidenceHash ? this.signer.url(i.evidenceHash) : null,
      createdAt: i.createdAt.toISOString(),
      dispute: dispute
        ? { note: dispute.note, raisedAt: dispute.raisedAt.toISOString(), resolvedAt: dispute.resolvedAt?.toISOString() ?? null, judgement: dispute.judgement, resolutionNote: dispute.resolutionNote }
        : null,
    };
  }

  /**
   * Judges one photographed part with a released rule version at a station. The photo, the
   * inspection, its measurements and its audit event are stored together; the same idempotency
   * key again returns the first inspection instead of a second one.
   */
  async inspect(actor: UserEntity, request: InspectRequest, photoBytes: Buffer, options: InspectOptions = {}): Promise<{ inspection: Inspection; created: boolean; timings: InspectTimings }> {
    const started = performance.now();
    const timings: InspectTimings = {};
    const lap = phaseClock(timings);
    const existing = await this.dataSource.getRepository(InspectionEntity).findOneBy({ idempotencyKey: request.idempotencyKey });
    if (existing) return { inspection: await this.sameRequestOrConflict(existing, actor, request), created: false, timings };

    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneBy({ id: request.ruleVersionId });
    if (!version) throw notFound('The rule version');
    if (version.state !== 'released') throw new AppError('conflict', `Version ${version.number} of this rule is ${version.state}; inspect with its released version`);
    const station = await this.dataSource.getRepository(StationEntity).findOneBy({ id: request.stationId });
    if (!station) throw notFound('The station');
    if (!station.active) throw new AppError('conflict', `${station.name} is not in use`);
    const line = await this.dataSource.getRepository(LineEntity).findOneByOrFail({ id: station.lineId });
    const rule = await this.dataSource.getRepository(RuleEntity).findOneByOrFail({ id: version.ruleId });
    await requireStationInspects(this.dataSource, station, rule.partType);
    lap('lookup');

    const photo = await decodeUploadedPhoto(photoBytes);
    lap('decode');
    // The photo is written while the pipeline runs; the row that names it commits only after both.
    const storing = this.store.put(photoBytes);
    storing.catch(() => undefined);
    // A photo the station's scale does not hold for is not measured at all: its mm figures would mean nothing.
    const wrongSize = wrongSizeQuality(photo, station);
    const judgement = wrongSize ? unmeasuredRetake(wrongSize) : await this.judge(version.document, station, photo, options, timings, lap);
    const { verdict, measurements } = judgement;
    const imageHash = await storing;
    lap('store');
    const durationMs = performance.now() - started;

    try {
      const id = await this.dataSource.transaction(async (manager) => {
        const inspection = await manager.save(
          manager.create(InspectionEntity, {
            idempotencyKey: request.idempotencyKey,
            ruleVersionId: version.id,
            ruleId: version.ruleId,
            stationId: station.id,
            lineId: line.id,
            partType: rule.partType,
            operatorId: actor.id,
            imageHash,
            evidenceHash: judgement.evidenceHash,
            verdict,
            cause: judgement.cause,
            quality: judgement.quality,
            mmPerPx: station.mmPerPx,
            durationMs,
            createdAt: options.at ?? new Date(),
          }),
        );
        if (measurements.length)
          await manager.insert(
            MeasurementEntity,
            measurements.map((m, position) => ({
              inspectionId: inspection.id,
              inspectionCreatedAt: inspection.createdAt,
              position,
              gauge: m.name,
              value: m.value,
              unit: m.unit ?? '',
              limitMin: m.limits.min ?? null,
              limitMax: m.limits.max ?? null,
              pass: m.pass,
            })),
          );
        await this.audit.record(manager, {
          actor: actorOf(actor),
          action: 'inspection.create',
          entityType: 'inspection',
          entityId: inspection.id,
          after: { verdict, imageHash, ruleVersionId: version.id, contentHash: version.contentHash },
          details: { station: station.name, rule: rule.name, version: version.number, verdict },
        });
        return inspection.id;
      });
      lap('database');
      const inspection = await this.get(id);
      lap('reply');
      return { inspection, created: true, timings };
    } catch (err) {
      // The same key raced in from a retry: the first one stored wins.
      if ((err as { code?: string }).code === '23505') {
        const winner = await this.dataSource.getRepository(InspectionEntity).findOneByOrFail({ idempotencyKey: request.idempotencyKey });
        return { inspection: await this.sameRequestOrConflict(winner, actor, request), created: false, timings };
      }
      throw err;
    }
  }

  /** Runs the rule in the pool at the station's scale; a FAIL's evidence image is stored. */
  private async judge(document: unknown, station: StationEntity, photo: DecodedPhoto, options: InspectOptions, timings: InspectTimings, lap: ReturnType<typeof phaseClock>): Promise<Judgement> {
    const run = await this.pool.run(document, photo, {
      mmPerPx: station.mmPerPx ?? undefined,
      retain: 'gauged',
      images: 'none',
      transferPhoto: true,
      evidence: options.evidence !== false,
    });
    lap('pipeline');
    timings.engine = run.ms;
    timings.steps = run.steps.map((s) => ({ op: s.op, ms: s.ms }));
    const evidenceHash = run.evidence ? await this.store.put(await this.evidenceOf(run, run.evidence)) : null;
    lap('evidence');
    return { verdict: run.verdict, cause: causeOf(run), quality: run.quality as unknown as Record<string, unknown>, measurements: run.measurements, evidenceHash };
  }

  private evidenceOf(run: RuleRun, raster: EvidenceRaster): Promise<Buffer> {
    let png = this.evidence.get(run);
    if (!png) {
      png = evidencePngOf(raster);
      this.evidence.set(run, png);
    }
    return png;
  }

  private async sameRequestOrConflict(existing: InspectionEntity, actor: UserEntity, request: InspectRequest): Promise<Inspection> {
    if (existing.operatorId !== actor.id || existing.stationId !== request.stationId || existing.ruleVersionId !== request.ruleVersionId)
      throw new AppError('conflict', 'This idempotency key belongs to another inspection; send a new key for a new part');
    return this.get(existing.id);
  }

  /** An operator challenges a verdict; a qualified person decides (supervisor's queue). */
  async dispute(actor: UserEntity, inspectionId: string, note: string): Promise<Inspection> {
    const inspection = await this.dataSource.getRepository(InspectionEntity).findOneBy({ id: inspectionId });
    if (!inspection) throw notFound('The inspection');
    await this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(DisputeEntity, { inspectionId })) throw new AppError('conflict', 'This verdict is already disputed');
      // inspection_created_at is filled in by the database (kw_fill_inspection_created_at): a Date read back
      // would lose the microseconds of a row not written by this service, and miss the foreign key.
      await manager.insert(DisputeEntity, { inspectionId, raisedBy: actor.id, note, raisedAt: new Date() });
      await this.audit.record(manager, { actor: actorOf(actor), action: 'inspection.dispute', entityType: 'inspection', entityId: inspectionId, details: { note } });
    });
    return this.get(inspectionId);
  }

  async listDisputes(state: 'open' | 'resolved', limit: number, offset: number): Promise<{ items: { id: string; inspection: Inspection }[]; total: number }> {
    const [rows, total] = await this.dataSource.getRepository(DisputeEntity).findAndCount({
      where: { resolvedAt: state === 'open' ? IsNull() : Not(IsNull()) },
      order: { raisedAt: state === 'open' ? 'ASC' : 'DESC' },
      take: limit,
      skip: offset,
    });
    return { items: await Promise.all(rows.map(async (d) => ({ id: d.id, inspection: await this.get(d.inspectionId) }))), total };
  }

  /** A supervisor records the qualified judgement of a disputed part; the inspection itself never changes. */
  async resolveDispute(actor: UserEntity, disputeId: string, judgement: 'good' | 'defective', note: string): Promise<Inspection> {
    const inspectionId = await this.dataSource.transaction(async (manager) => {
      const dispute = await manager.findOne(DisputeEntity, { where: { id: disputeId }, lock: { mode: 'pessimistic_write' } });
      if (!dispute) throw notFound('The dispute');
      if (dispute.resolvedAt) throw new AppError('conflict', 'This dispute is already resolved');
      Object.assign(dispute, { resolvedBy: actor.id, judgement, resolutionNote: note, resolvedAt: new Date() });
      await manager.save(dispute);
      await this.audit.record(manager, { actor: actorOf(actor), action: 'inspection.dispute-resolve', entityType: 'inspection', entityId: dispute.inspectionId, details: { judgement, note } });
      return dispute.inspectionId;
    });
    return this.get(inspectionId);
  }

  /** A fresh idempotency key (for callers that are not clients, such as the seed). */
  static newKey(): string {
    return crypto.randomUUID();
  }
}
