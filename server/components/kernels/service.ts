import type { DataSource } from 'typeorm';
import type { KernelDefinition } from '../../../shared/vision/kernels';
import type { KernelLibrary } from '../../../shared/vision/pipeline';
import { loadKernelLibrary } from '../../vision/kernel-library';
import { CustomKernelEntity } from './entities';

/** The kernel library a rule may name: the built-in files of kernels/ and the engineers' own. */
export class KernelsService {
  private builtIn: Promise<Map<string, KernelDefinition>> | null = null;

  constructor(private readonly dataSource: DataSource) {}

  private builtInLibrary(): Promise<Map<string, KernelDefinition>> {
    this.builtIn ??= loadKernelLibrary();
    return this.builtIn;
  }

  async library(): Promise<KernelLibrary> {
    const library = new Map(await this.builtInLibrary());
    const custom = await this.dataSource.getRepository(CustomKernelEntity).find();
    for (const k of custom) {
      library.set(k.name, { name: k.name, matrix: k.matrix, divisor: k.divisor, offset: k.offset, description: k.description, source: 'Added by an engineer' });
    }
    return library;
  }
}
