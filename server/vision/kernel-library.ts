// The built-in kernel library: reads kernels/*.json, validates each file, and hands the engine
// a name → kernel map (the engine itself never reads files).
import { existsSync, promises as fs } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { zodIssues } from '../../shared/api/errors';
import { MAX_KERNEL_SIDE } from '../../shared/rules/schema';
import type { KernelDefinition } from '../../shared/vision/kernels';
import type { KernelLibrary } from '../../shared/vision/pipeline';

/** kernels/ at the repository root, from the source tree (server/vision) or the build (dist-server/server/vision). */
export const KERNELS_DIR =
  [path.resolve(__dirname, '..', '..', 'kernels'), path.resolve(__dirname, '..', '..', '..', 'kernels')].find((dir) => existsSync(dir)) ??
  path.resolve(__dirname, '..', '..', 'kernels');

export const kernelDefinitionSchema = z
  .strictObject({
    name: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'a kernel name uses lower-case letters, digits and single hyphens'),
    matrix: z.array(z.array(z.number()).min(1)).min(1),
    divisor: z.number().refine((d) => d !== 0, 'divisor must not be 0'),
    offset: z.number(),
    description: z.string().trim().min(10, 'describe what the kernel shows'),
    source: z.string().trim().min(5, 'name the published source'),
  })
  .superRefine((k, ctx) => {
    const rows = k.matrix.length;
    const cols = k.matrix[0].length;
    if (rows % 2 === 0 || rows > MAX_KERNEL_SIDE || cols % 2 === 0 || cols > MAX_KERNEL_SIDE) {
      ctx.addIssue({ code: 'custom', path: ['matrix'], message: `a kernel needs odd rows and columns up to ${MAX_KERNEL_SIDE}, got ${rows}x${cols}` });
    }
    k.matrix.forEach((row, j) => {
      if (row.length !== cols) ctx.addIssue({ code: 'custom', path: ['matrix', j], message: `row ${j} has ${row.length} values, expected ${cols}` });
    });
  });

export class KernelLibraryError extends Error {
  constructor(readonly file: string, message: string) {
    super(`${file}: ${message}`);
    this.name = 'KernelLibraryError';
  }
}

/** Parses one kernel file's text; the name must match the file name. */
export function parseKernelFile(fileName: string, text: string): KernelDefinition {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new KernelLibraryError(fileName, `not valid JSON (${(e as Error).message})`);
  }
  const parsed = kernelDefinitionSchema.safeParse(json);
  if (!parsed.success) {
    const issue = zodIssues(parsed.error)[0];
    throw new KernelLibraryError(fileName, `${issue.path}: ${issue.message}`);
  }
  const expected = path.basename(fileName, '.json');
  if (parsed.data.name !== expected) throw new KernelLibraryError(fileName, `name "${parsed.data.name}" differs from the file name "${expected}"`);
  return parsed.data;
}

/** Loads every kernels/*.json file, sorted by name. */
export async function loadKernelLibrary(dir = KERNELS_DIR): Promise<Map<string, KernelDefinition>> {
  const files = (await fs.readdir(dir)).filter((f) => f.endsWith('.json')).sort();
  const library = new Map<string, KernelDefinition>();
  for (const file of files) {
    const kernel = parseKernelFile(file, await fs.readFile(path.join(dir, file), 'utf8'));
    library.set(kernel.name, kernel);
  }
  return library;
}

/** A plain object form, for sending the library to worker threads. */
export function libraryEntries(library: KernelLibrary): KernelDefinition[] {
  return [...library.values()];
}
