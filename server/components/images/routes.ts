import { Router } from 'express';
import { z } from 'zod';
import { AppError } from '../../lib/errors';
import type { ImageUrlSigner } from '../../lib/image-urls';
import { ImageNotFoundError, type ImageStore } from '../../lib/storage/image-store';
import { parse } from '../../lib/validate';
import sharp from 'sharp';
import { decodePhoto } from '../../vision/decode';

const params = z.object({ hash: z.string().regex(/^[0-9a-f]{64}$/, 'Not an image hash') });
const query = z.object({ exp: z.coerce.number().int(), sig: z.string().max(100) });

/** Serves stored images to holders of a signed address (see ImageUrlSigner). */
export function imageRoutes(store: ImageStore, signer: ImageUrlSigner): Router {
  const router = Router();
  const load = async (rawParams: unknown, rawQuery: unknown): Promise<Buffer> => {
    const { hash } = parse(params, rawParams);
    const { exp, sig } = parse(query, rawQuery);
    if (!signer.verify(hash, exp, sig)) throw new AppError('forbidden', 'This image address has expired or is not valid; reload the page');
    try {
      return await store.get(hash);
    } catch (err) {
      if (err instanceof ImageNotFoundError) throw new AppError('not_found', 'The image was not found');
      throw err;
    }
  };
  /**
   * The photo's samples exactly as the server decodes them (8- or 16-bit, little-endian), so that a
   * preview in the browser runs the engine on the same numbers as the server.
   */
  router.get('/:hash/samples', async (req, res) => {
    const photo = await decodePhoto(await load(req.params, req.query));
    res.set({
      'Content-Type': 'application/octet-stream',
      'Cache-Control': 'private, max-age=3600, immutable',
      'X-Photo-Width': String(photo.width),
      'X-Photo-Height': String(photo.height),
      'X-Photo-Channels': String(photo.channels),
      'X-Photo-Bit-Depth': String(photo.bitDepth),
    });
    res.send(Buffer.from(photo.samples.buffer, photo.samples.byteOffset, photo.samples.byteLength));
  });
  router.get('/:hash', async (req, res) => {
    const bytes = await load(req.params, req.query);
    const { format } = await sharp(bytes).metadata();
    res.set('Content-Type', `image/${format === 'jpeg' ? 'jpeg' : format ?? 'octet-stream'}`);
    res.set('Cache-Control', 'private, max-age=3600, immutable');
    res.set('X-Content-Type-Options', 'nosniff');
    res.send(bytes);
  });
  return router;
}
