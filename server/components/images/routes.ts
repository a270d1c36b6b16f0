import { Router } from 'express';
import { z } from 'zod';
import { AppError } from '../../lib/errors';
import type { ImageUrlSigner } from '../../lib/image-urls';
import { ImageNotFoundError, type ImageStore } from '../../lib/storage/image-store';
import { parse } from '../../lib/validate';
import sharp from 'sharp';

const params = z.object({ hash: z.string().regex(/^[0-9a-f]{64}$/, 'Not an image hash') });
const query = z.object({ exp: z.coerce.number().int(), sig: z.string().max(100) });

/** Serves stored images to holders of a signed address (see ImageUrlSigner). */
export function imageRoutes(store: ImageStore, signer: ImageUrlSigner): Router {
  const router = Router();
  router.get('/:hash', async (req, res) => {
    const { hash } = parse(params, req.params);
    const { exp, sig } = parse(query, req.query);
    if (!signer.verify(hash, exp, sig)) throw new AppError('forbidden', 'This image address has expired or is not valid; reload the page');
    let bytes: Buffer;
    try {
      bytes = await store.get(hash);
    } catch (err) {
      if (err instanceof ImageNotFoundError) throw new AppError('not_found', 'The image was not found');
      throw err;
    }
    const { format } = await sharp(bytes).metadata();
    res.set('Content-Type', `image/${format === 'jpeg' ? 'jpeg' : format ?? 'octet-stream'}`);
    res.set('Cache-Control', 'private, max-age=3600, immutable');
    res.set('X-Content-Type-Options', 'nosniff');
    res.send(bytes);
  });
  return router;
}
