import type { DataSource } from 'typeorm';
import type { AttributeAgreement, AttributeAgreementQuery, CreateRepeatabilityStudy, RepeatabilityStudy } from '../../../shared/api/studies';
import { attributeFigures, type AttributeCounts } from '../../../shared/metrics/attribute-agreement';
import { gaugeSpreads, type GaugeReading } from '../../../shared/metrics/repeatability';
import { RuleRunError, type RuleRun } from '../../../shared/vision/pipeline';
import { AppError, notFound } from '../../lib/errors';
import type { ImageStore } from '../../lib/storage/image-store';
import { decodeUploadedPhoto } from '../../vision/decode-upload';
import type { PipelineRunner } from '../../vision/runner';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { causeOf } from '../inspections/service';
import { RuleVersionEntity } from '../rules/entities';
import { StationEntity } from '../stations/entities';
import { RepeatabilityPhotoEntity, RepeatabilityStudyEntity } from './entities';

const LIST_SIZE = 100;
const JUDGED_AT_ONCE = 2;

interface StudyRow {
  id: string;
  rule_id: string;
  rule_name: string;
  rule_version_id: string;
  rule_version_number: number;
  station_id: string;
  station_name: string;
  part_label: string;
  known_label: RepeatabilityStudy['knownLabel'];
  created_by: string;
  created_at: Date;
}

const STUDY_SELECT = `
  select st.id, v.rule_id, r.name as rule_name, st.rule_version_id, v.number as rule_version_number, st.station_id, s.name as station_name,
         st.part_label, st.known_label, u.display_name as created_by, st.created_at
  from repeatability_studies st
  join rule_versions v on v.id = st.rule_version_id
  join rules r on r.id = v.rule_id
  join stations s on s.id = st.station_id
  join users u on u.id = st.created_by`;

/** Measurement system analysis: the rule against itself (repeatability) and against people (attribute agreement). */
export class StudiesService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly audit: AuditService,
    private readonly pool: PipelineRunner,
  ) {}

  /**
   * Judges every photo of one part with one rule version at the station's calibration, as an
   * inspection would, and keeps the photos (by content) and each verdict and measurement. Nothing is
   * stored unless every photo could be judged.
   */
  async createRepeatability(actor: UserEntity, input: CreateRepeatabilityStudy, photos: readonly Buffer[]): Promise<RepeatabilityStudy> {
    const version = await this.dataSource.getRepository(RuleVersionEntity).findOneBy({ id: input.ruleVersionId });
    if (!version) throw notFound('The rule version');
    const station = await this.dataSource.getRepository(StationEntity).findOneBy({ id: input.stationId });
    if (!station) throw notFound('The station');

    const judge = async (i: number): Promise<RuleRun> => {
      const photo = await decodeUploadedPhoto(photos[i], `Photo ${i + 1}`, `photos[${i}]`);
      try {
        return await this.pool.run(version.document, photo, { mmPerPx: station.mmPerPx ?? undefined, retain: 'gauged', images: 'none', transferPhoto: true });
      } catch (err) {
        if (err instanceof RuleRunError) throw new AppError('conflict', `Version ${version.number} cannot be run at ${station.name}: ${err.message}`, { issues: err.issues });
        throw err;
      }
    };
    // A few photos at a time: the pool's threads stay busy while only a few decoded photos are held.
    const runs: RuleRun[] = new Array(photos.length);
    let next = 0;
    await Promise.all(
      Array.from({ length: Math.min(JUDGED_AT_ONCE, photos.length) }, async () => {
        while (next < photos.length) {
          const i = next++;
          runs[i] = await judge(i);
        }
      }),
    );
    const hashes: string[] = [];
    for (const bytes of photos) hashes.push(await this.store.put(bytes));

    const id = await this.dataSource.transaction(async (manager) => {
      const study = await manager.save(
        manager.create(RepeatabilityStudyEntity, {
          ruleVersionId: version.id,
          stationId: station.id,
          mmPerPx: station.mmPerPx,
          partLabel: input.partLabel,
          knownLabel: input.knownLabel,
          createdBy: actor.id,
        }),
      );
      await manager.save(
        manager.create(
          RepeatabilityPhotoEntity,
          runs.map((run, i) => ({
            studyId: study.id,
            position: i + 1,
            imageHash: hashes[i],
            verdict: run.verdict,
            cause: causeOf(run),
            measurements: run.measurements.map((m) => ({ name: m.name, value: m.value, unit: m.unit, limits: m.limits, pass: m.pass })),
            quality: run.quality as unknown as Record<string, unknown>,
          })),
        ),
      );
      await this.audit.record(manager, {
        actor: actorOf(actor),
        action: 'study.repeatability.create',
        entityType: 'repeatability-study',
        entityId: study.id,
        after: { ruleVersionId: version.id, contentHash: version.contentHash, stationId: station.id, images: hashes },
        details: { part: input.partLabel, photos: photos.length, verdicts: runs.map((r) => r.verdict) },
      });
      return study.id;
    });
    return this.getRepeatability(id);
  }

  async getRepeatability(id: string): Promise<RepeatabilityStudy> {
    const [row] = (await this.dataSource.query(`${STUDY_SELECT} where st.id = $1`, [id])) as StudyRow[];
    if (!row) throw notFound('The repeatability study');
    return this.toDto(row);
  }

  /** Newest first. */
  async listRepeatability(): Promise<RepeatabilityStudy[]> {
    const rows = (await this.dataSource.query(`${STUDY_SELECT} order by st.created_at desc, st.id desc limit ${LIST_SIZE}`)) as StudyRow[];
    return Promise.all(rows.map((row) => this.toDto(row)));
  }

  private async toDto(row: StudyRow): Promise<RepeatabilityStudy> {
    const photos = await this.dataSource.getRepository(RepeatabilityPhotoEntity).find({ where: { studyId: row.id }, order: { position: 'ASC' } });
    const verdicts = { PASS: 0, FAIL: 0, RETAKE: 0 };
    for (const p of photos) verdicts[p.verdict] += 1;
    // An unusable photo says nothing about the part: its gauges are left out of the spread.
    const judged = photos.filter((p) => p.verdict !== 'RETAKE');
    return {
      id: row.id,
      ruleId: row.rule_id,
      ruleName: row.rule_name,
      ruleVersionId: row.rule_version_id,
      ruleVersionNumber: row.rule_version_number,
      stationId: row.station_id,
      stationName: row.station_name,
      partLabel: row.part_label,
      knownLabel: row.known_label,
      createdBy: row.created_by,
      createdAt: row.created_at.toISOString(),
      photos: photos.length,
      verdicts,
      consistent: verdicts.PASS === 0 || verdicts.FAIL === 0,
      results: photos.map((p) => ({ position: p.position, verdict: p.verdict, cause: p.cause })),
      gauges: gaugeSpreads(judged.map((p) => p.measurements as GaugeReading[])),
    };
  }

  /** The rule's verdicts against a qualified person's judgement: resolved disputes, or a finished trial's labels. */
  async attributeAgreement(query: AttributeAgreementQuery): Promise<AttributeAgreement> {
    const rows = query.source === 'disputes' ? await this.disputePairs(query) : await this.trialPairs(query.trialId);
    const counts: AttributeCounts = { defectiveFailed: 0, defectivePassed: 0, goodFailed: 0, goodPassed: 0, retakes: 0 };
    for (const { verdict, judgement, n } of rows) {
      if (verdict === 'RETAKE') counts.retakes += n;
      else if (judgement === 'defective') counts[verdict === 'FAIL' ? 'defectiveFailed' : 'defectivePassed'] += n;
      else counts[verdict === 'FAIL' ? 'goodFailed' : 'goodPassed'] += n;
    }
    return { source: query.source, counts, ...attributeFigures(counts) };
  }

  private async disputePairs(query: Extract<AttributeAgreementQuery, { source: 'disputes' }>): Promise<{ verdict: string; judgement: string; n: number }[]> {
    if (!(await this.dataSource.query('select 1 from rules where id = $1', [query.ruleId])).length) throw notFound('The rule');
    const params: unknown[] = [query.ruleId];
    let range = '';
    if (query.from) {
      params.push(query.from);
      range += ` and i.created_at >= $${params.length}`;
    }
    if (query.to) {
      params.push(query.to);
      range += ` and i.created_at < $${params.length}`;
    }
    return this.dataSource.query(
      `select i.verdict, d.judgement, count(*)::int as n from disputes d join inspections i on i.id = d.inspection_id
       where i.rule_id = $1 and d.judgement is not null${range} group by 1, 2`,
      params,
    );
  }

  private async trialPairs(trialId: string): Promise<{ verdict: string; judgement: string; n: number }[]> {
    const [trial] = await this.dataSource.query('select state from trials where id = $1', [trialId]);
    if (!trial) throw notFound('The trial');
    if (trial.state !== 'done') throw new AppError('conflict', 'The trial has not finished yet');
    return this.dataSource.query(
      `select verdict, label as judgement, count(*)::int as n from trial_results where trial_id = $1 and label in ('good', 'defective') group by 1, 2`,
      [trialId],
    );
  }
}
