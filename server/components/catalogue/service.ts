import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { createDefectKindRequestSchema, DefectKind, PartType } from '../../../shared/api/catalogue';
import { AppError } from '../../lib/errors';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { DefectKindEntity, PartTypeEntity } from './entities';

/** The plant's lists: part types and defect kinds. */
export class CatalogueService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  partTypes(): Promise<PartType[]> {
    return this.dataSource.getRepository(PartTypeEntity).find({ order: { family: 'ASC', name: 'ASC' } });
  }

  defectKinds(): Promise<DefectKind[]> {
    return this.dataSource.getRepository(DefectKindEntity).find({ order: { name: 'ASC' } });
  }

  async addDefectKind(actor: UserEntity, input: z.output<typeof createDefectKindRequestSchema>): Promise<DefectKind> {
    return this.dataSource.transaction(async (manager) => {
      const repo = manager.getRepository(DefectKindEntity);
      if (await repo.existsBy({ code: input.code }))
        throw new AppError('conflict', `The defect kind "${input.code}" exists`, { issues: [{ path: 'code', message: 'Already taken' }] });
      const saved = await repo.save(repo.create(input));
      await this.audit.record(manager, { actor: actorOf(actor), action: 'defect-kind.create', entityType: 'defect-kind', entityId: saved.code, after: input });
      return saved;
    });
  }
}
