import { AppError } from '../lib/errors';
import { decodePhoto, PhotoDecodeError, type DecodedPhoto } from './decode';

/**
 * Decodes a photo sent to the API; a photo that cannot be judged becomes the API's error with the
 * status its problem calls for (413 too many pixels, 415 not an accepted image, 400 damaged).
 */
export async function decodeUploadedPhoto(bytes: Uint8Array, subject = 'The photo', path?: string): Promise<DecodedPhoto> {
  try {
    return await decodePhoto(bytes);
  } catch (err) {
    if (!(err instanceof PhotoDecodeError)) throw err;
    const code = err.status === 413 ? 'payload_too_large' : err.status === 415 ? 'unsupported_media' : 'bad_request';
    const message = `${subject} cannot be inspected: ${err.message}`;
    throw new AppError(code, message, path ? { code: err.code, issues: [{ path, message }] } : { code: err.code });
  }
}
