import type { DataSource } from 'typeorm';
import type { PreviewResult } from '../../../shared/api/preview';
import { RuleRunError } from '../../../shared/vision/pipeline';
import { AppError, notFound } from '../../lib/errors';
import type { ImageStore } from '../../lib/storage/image-store';
import { decodePhoto } from '../../vision/decode';
import type { PipelineRunner } from '../../vision/runner';
import { ReferenceImageEntity } from '../references/entities';
import type { RulesService } from '../rules/service';
import { StationEntity } from '../stations/entities';

/** The server's answer for a rule on one reference photo: the authority the browser preview is checked against. */
export class PreviewService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly rules: RulesService,
    private readonly pool: PipelineRunner,
  ) {}

  async run(document: unknown, referenceImageId: string, stationId?: string): Promise<PreviewResult> {
    const checked = await this.rules.checkDocument(document);
    const image = await this.dataSource.getRepository(ReferenceImageEntity).findOneBy({ id: referenceImageId });
    if (!image) throw notFound('The reference photo');
    const station = stationId ? await this.dataSource.getRepository(StationEntity).findOneBy({ id: stationId }) : null;
    if (stationId && !station) throw notFound('The station');
    const photo = await decodePhoto(await this.store.get(image.contentHash));
    try {
      const run = await this.pool.run(checked, photo, { mmPerPx: station?.mmPerPx ?? undefined, retain: 'gauged', images: 'none', transferPhoto: true });
      return {
        verdict: run.verdict,
        quality: { focus: run.quality.focus, clipped: run.quality.clipped, mean: run.quality.mean, pass: run.quality.pass, problems: [...run.quality.problems] },
        measurements: run.measurements.map((m) => ({ name: m.name, value: m.value, unit: m.unit, limits: m.limits, pass: m.pass })),
        steps: run.steps.map((s) => ({ op: s.op, ms: s.ms })),
        ms: run.ms,
      };
    } catch (err) {
      if (err instanceof RuleRunError) throw new AppError('validation_failed', err.message, { issues: err.issues });
      throw err;
    }
  }
}
