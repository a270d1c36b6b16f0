import crypto from 'node:crypto';
import type { DataSource, Repository } from 'typeorm';
import type { z } from 'zod';
import type {
  createReferenceSetRequestSchema,
  labelChangeSchema,
  listReferenceImagesQuerySchema,
  ReferenceImage,
  ReferenceSet,
  UploadOutcome,
} from '../../../shared/api/references';
import { AppError, notFound } from '../../lib/errors';
import type { ImageUrlSigner } from '../../lib/image-urls';
import type { ImageStore } from '../../lib/storage/image-store';
import { makeThumbnail } from '../../lib/thumbnails';
import { decodePhoto, PhotoDecodeError } from '../../vision/decode';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { DefectKindEntity, PartTypeEntity } from '../catalogue/entities';
import { ReferenceImageEntity, ReferenceSetEntity } from './entities';

type CreateSet = z.output<typeof createReferenceSetRequestSchema>;
type LabelChange = z.output<typeof labelChangeSchema>;
type ListImages = z.output<typeof listReferenceImagesQuerySchema>;

export interface UploadedFile {
  fileName: string;
  bytes: Buffer;
}

const MEDIA_TYPES: Record<string, string> = { jpeg: 'image/jpeg', png: 'image/png', tiff: 'image/tiff', webp: 'image/webp' };

export class ReferencesService {
  private readonly sets: Repository<ReferenceSetEntity>;
  private readonly images: Repository<ReferenceImageEntity>;

  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly signer: ImageUrlSigner,
    private readonly audit: AuditService,
  ) {
    this.sets = dataSource.getRepository(ReferenceSetEntity);
    this.images = dataSource.getRepository(ReferenceImageEntity);
  }

  private async requirePartType(code: string): Promise<void> {
    if (!(await this.dataSource.getRepository(PartTypeEntity).existsBy({ code })))
      throw new AppError('validation_failed', `partType: unknown part type "${code}"`, { issues: [{ path: 'partType', message: 'Unknown part type' }] });
  }

  private async requireDefectKind(code: string | null | undefined): Promise<void> {
    if (!code) return;
    if (!(await this.dataSource.getRepository(DefectKindEntity).existsBy({ code })))
      throw new AppError('validation_failed', `defectKind: unknown defect kind "${code}"`, { issues: [{ path: 'defectKind', message: 'Unknown defect kind' }] });
  }

  toImageDto(image: ReferenceImageEntity): ReferenceImage {
    return {
      id: image.id,
      setId: image.setId,
      contentHash: image.contentHash,
      fileName: image.fileName,
      mediaType: image.mediaType,
      width: image.width,
      height: image.height,
      bitDepth: image.bitDepth,
      label: image.label,
      defectKind: image.defectKind,
      partType: image.partType,
      note: image.note,
      imageUrl: this.signer.url(image.contentHash),
      thumbnailUrl: image.thumbnailHash ? this.signer.url(image.thumbnailHash) : null,
      createdAt: image.createdAt.toISOString(),
    };
  }

  private async counts(setIds: string[]): Promise<Map<string, ReferenceSet['counts']>> {
    const rows: { set_id: string; label: string; n: string }[] = setIds.length
      ? await this.dataSource.query('select set_id, label, count(*) as n from reference_images where set_id = any($1) group by set_id, label', [setIds])
      : [];
    const out = new Map<string, ReferenceSet['counts']>();
    for (const id of setIds) out.set(id, { total: 0, good: 0, defective: 0, retake: 0, unlabelled: 0 });
    for (const row of rows) {
      const c = out.get(row.set_id)!;
      c[row.label as keyof ReferenceSet['counts']] = Number(row.n);
      c.total += Number(row.n);
    }
    return out;
  }

  async listSets(): Promise<ReferenceSet[]> {
    const sets = await this.sets.find({ order: { name: 'ASC' } });
    const counts = await this.counts(sets.map((s) => s.id));
    return sets.map((s) => ({ ...s, createdAt: s.createdAt.toISOString(), counts: counts.get(s.id)! }));
  }

  async getSet(id: string): Promise<ReferenceSet> {
    const set = await this.sets.findOneBy({ id });
    if (!set) throw notFound('The reference set');
    return { ...set, createdAt: set.createdAt.toISOString(), counts: (await this.counts([id])).get(id)! };
  }

  async createSet(actor: UserEntity, input: CreateSet): Promise<ReferenceSet> {
    await this.requirePartType(input.partType);
    try {
      const id = await this.dataSource.transaction(async (manager) => {
        const saved = await manager.getRepository(ReferenceSetEntity).save(manager.create(ReferenceSetEntity, { ...input, createdBy: actor.id }));
        await this.audit.record(manager, { actor: actorOf(actor), action: 'reference-set.create', entityType: 'reference-set', entityId: saved.id, after: input });
        return saved.id;
      });
      return this.getSet(id);
    } catch (err) {
      if ((err as { code?: string }).code === '23505') throw new AppError('conflict', `A reference set named "${input.name}" exists`, { issues: [{ path: 'name', message: 'Already taken' }] });
      throw err;
    }
  }

  /**
   * Adds photos to a set, each on its own: a photo is checked by decoding its content (not its
   * name), stored with a thumbnail, and recorded with its audit event in one transaction. A photo
   * already in the set (same SHA-256) is reported, not stored twice.
   */
  async addImages(actor: UserEntity, setId: string, files: UploadedFile[], labels: Partial<Pick<ReferenceImageEntity, 'label' | 'defectKind' | 'note'>> = {}): Promise<UploadOutcome[]> {
    const set = await this.sets.findOneBy({ id: setId });
    if (!set) throw notFound('The reference set');
    await this.requireDefectKind(labels.defectKind);
    const outcomes: UploadOutcome[] = [];
    for (const file of files) outcomes.push(await this.addImage(actor, set, file, labels));
    return outcomes;
  }

  private async addImage(actor: UserEntity, set: ReferenceSetEntity, file: UploadedFile, labels: Partial<Pick<ReferenceImageEntity, 'label' | 'defectKind' | 'note'>>): Promise<UploadOutcome> {
    const fileName = file.fileName.slice(0, 255) || 'photo';
    const contentHash = crypto.createHash('sha256').update(file.bytes).digest('hex');
    const existing = await this.images.findOneBy({ setId: set.id, contentHash });
    if (existing) return { status: 'duplicate', fileName, existingImageId: existing.id };
    let photo;
    try {
      photo = await decodePhoto(file.bytes);
    } catch (err) {
      if (err instanceof PhotoDecodeError) return { status: 'refused', fileName, code: err.code, message: `${fileName}: ${err.message}` };
      throw err;
    }
    await this.store.put(file.bytes);
    const thumbnailHash = await this.store.put(await makeThumbnail(file.bytes));
    const label = labels.label ?? 'unlabelled';
    try {
      const saved = await this.dataSource.transaction(async (manager) => {
        const image = await manager.getRepository(ReferenceImageEntity).save(
          manager.create(ReferenceImageEntity, {
            setId: set.id,
            contentHash,
            thumbnailHash,
            fileName,
            mediaType: MEDIA_TYPES[photo.format],
            width: photo.width,
            height: photo.height,
            bitDepth: photo.bitDepth,
            label,
            defectKind: label === 'defective' ? (labels.defectKind ?? null) : null,
            partType: set.partType,
            note: labels.note ?? '',
            uploadedBy: actor.id,
          }),
        );
        await this.audit.record(manager, {
          actor: actorOf(actor),
          action: 'reference-image.add',
          entityType: 'reference-image',
          entityId: image.id,
          after: { setId: set.id, contentHash, label: image.label, defectKind: image.defectKind },
          details: { set: set.name, fileName },
        });
        return image;
      });
      return { status: 'stored', fileName, image: this.toImageDto(saved) };
    } catch (err) {
      // Two uploads of the same photo at once: the unique index keeps one.
      if ((err as { code?: string }).code === '23505') {
        const winner = await this.images.findOneByOrFail({ setId: set.id, contentHash });
        return { status: 'duplicate', fileName, existingImageId: winner.id };
      }
      throw err;
    }
  }

  async listImages(setId: string, query: ListImages): Promise<{ items: ReferenceImage[]; total: number }> {
    if (!(await this.sets.existsBy({ id: setId }))) throw notFound('The reference set');
    const where = { setId, ...(query.label ? { label: query.label } : {}), ...(query.defectKind ? { defectKind: query.defectKind } : {}) };
    const [rows, total] = await this.images.findAndCount({ where, order: { createdAt: 'ASC', id: 'ASC' }, take: query.limit, skip: query.offset });
    return { items: rows.map((r) => this.toImageDto(r)), total };
  }

  async getImage(id: string): Promise<ReferenceImageEntity> {
    const image = await this.images.findOneBy({ id });
    if (!image) throw notFound('The reference image');
    return image;
  }

  /** Relabels one or many images of a set; each change is audited with before and after. */
  async relabel(actor: UserEntity, imageIds: string[], change: LabelChange, setId?: string): Promise<ReferenceImage[]> {
    await this.requireDefectKind(change.defectKind);
    return this.dataSource.transaction(async (manager) => {
      const repo = manager.getRepository(ReferenceImageEntity);
      const rows = await repo.find({ where: imageIds.map((id) => ({ id, ...(setId ? { setId } : {}) })), lock: { mode: 'pessimistic_write' } });
      if (rows.length !== new Set(imageIds).size) throw notFound(imageIds.length === 1 ? 'The reference image' : 'One of the reference images');
      const out: ReferenceImage[] = [];
      for (const image of rows) {
        const before = { label: image.label, defectKind: image.defectKind, note: image.note };
        if (change.label !== undefined) image.label = change.label;
        if (change.defectKind !== undefined) image.defectKind = change.defectKind;
        if (image.label !== 'defective') image.defectKind = null;
        if (change.note !== undefined) image.note = change.note;
        const after = { label: image.label, defectKind: image.defectKind, note: image.note };
        await repo.save(image);
        await this.audit.record(manager, { actor: actorOf(actor), action: 'reference-image.label', entityType: 'reference-image', entityId: image.id, before, after, details: { before, after } });
        out.push(this.toImageDto(image));
      }
      return out;
    });
  }
}
