/** Where photos, thumbnails and evidence images live, addressed by the SHA-256 of their bytes. */
export interface ImageStore {
  /** Stores the bytes (once; storing the same bytes again is a no-op) and returns their SHA-256 hex. */
  put(bytes: Buffer): Promise<string>;
  get(hash: string): Promise<Buffer>;
  has(hash: string): Promise<boolean>;
  /**
   * The hash of every stored image, each once, in no promised order, read page by page (never the
   * whole listing at once). A name in the storage that is not an image's (a half-written file, an
   * object another program put there) is passed to `skipped` instead.
   */
  list(skipped?: (name: string) => void): AsyncIterable<string>;
}

export class ImageNotFoundError extends Error {
  constructor(readonly hash: string) {
    super(`No stored image with hash ${hash}`);
  }
}

export const HASH_PATTERN = /^[0-9a-f]{64}$/;
