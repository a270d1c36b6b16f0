import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { createKernelRequestSchema, KernelInfo } from '../../../shared/api/kernels';
import type { KernelDefinition } from '../../../shared/vision/kernels';
import type { KernelLibrary } from '../../../shared/vision/pipeline';
import { AppError } from '../../lib/errors';
import { loadKernelLibrary } from '../../vision/kernel-library';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { CustomKernelEntity } from './entities';

/** The kernel library a rule may name: the built-in files of kernels/ and the engineers' own. */
export class KernelsService {
  private builtIn: Promise<Map<string, KernelDefinition>> | null = null;

  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  private builtInLibrary(): Promise<Map<string, KernelDefinition>> {
    this.builtIn ??= loadKernelLibrary();
    return this.builtIn;
  }

  async library(): Promise<KernelLibrary> {
    const library = new Map(await this.builtInLibrary());
    for (const k of await this.dataSource.getRepository(CustomKernelEntity).find()) {
      library.set(k.name, { name: k.name, matrix: k.matrix, divisor: k.divisor, offset: k.offset, description: k.description, source: 'Added by an engineer' });
    }
    return library;
  }

  async list(): Promise<KernelInfo[]> {
    const builtIn = await this.builtInLibrary();
    return [...(await this.library()).values()].map((k) => ({
      name: k.name,
      matrix: k.matrix.map((row) => [...row]),
      divisor: k.divisor,
      offset: k.offset,
      description: k.description,
      source: k.source,
      builtIn: builtIn.has(k.name),
    }));
  }

  async add(actor: UserEntity, input: z.output<typeof createKernelRequestSchema>): Promise<KernelInfo> {
    if ((await this.builtInLibrary()).has(input.name))
      throw new AppError('conflict', `"${input.name}" is a built-in kernel; choose another name`, { issues: [{ path: 'name', message: 'Taken by a built-in kernel' }] });
    return this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(CustomKernelEntity, { name: input.name }))
        throw new AppError('conflict', `A kernel named "${input.name}" exists`, { issues: [{ path: 'name', message: 'Already taken' }] });
      await manager.insert(CustomKernelEntity, { ...input, createdBy: actor.id });
      await this.audit.record(manager, { actor: actorOf(actor), action: 'kernel.create', entityType: 'kernel', entityId: input.name, after: input });
      return { ...input, source: 'Added by an engineer', builtIn: false };
    });
  }
}
