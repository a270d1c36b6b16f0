import crypto from 'node:crypto';
import { GetObjectCommand, HeadObjectCommand, ListObjectsCommand, ListObjectsV2Command, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import { HASH_PATTERN, ImageNotFoundError, type ImageStore } from './image-store';

export interface S3StoreOptions {
  bucket: string;
  /** Runs once before the first request (e.g. starting the stand-in server on loopback). */
  beforeFirstUse?: () => Promise<void>;
  /** Keys asked for per listing page; absent: the server's default (1,000 on S3). */
  listPageSize?: number;
  /**
   * List with ListObjects version 1, each page starting after the last key of the one before,
   * instead of ListObjectsV2's continuation tokens: for the stand-in, whose tokens need DES, a cipher
   * that OpenSSL 3 (Node 17 and later) leaves out, so every truncated version 2 page fails there.
   */
  markerListing?: boolean;
}

/** A stored object whose bytes no longer hash to its name. */
export class DamagedImageError extends Error {
  constructor(readonly hash: string) {
    super(`The stored image ${hash} does not match its SHA-256; the object store returned other bytes`);
  }
}

function isMissing(err: unknown): boolean {
  return err instanceof S3ServiceException && (err.$metadata.httpStatusCode === 404 || err.name === 'NoSuchKey' || err.name === 'NotFound');
}

/**
 * Image store in an S3-compatible bucket: one object per image, named by the SHA-256 of its bytes.
 * S3 makes a PUT visible whole or not at all, so no reader sees half an image; the SHA-256 travels
 * with the PUT (x-amz-checksum-sha256) for the server to check, and every read is checked against
 * the name, so a damaged object is an error rather than a wrong photo.
 */
export class S3ImageStore implements ImageStore {
  private ready: Promise<void> | null = null;

  constructor(
    private readonly client: S3Client,
    private readonly options: S3StoreOptions,
  ) {}

  private keyOf(hash: string): string {
    if (!HASH_PATTERN.test(hash)) throw new Error(`Not an image hash: ${hash}`);
    return hash;
  }

  private async send<T>(run: () => Promise<T>): Promise<T> {
    if (this.options.beforeFirstUse) {
      this.ready ??= this.options.beforeFirstUse().catch((err: unknown) => {
        this.ready = null;
        throw err;
      });
      await this.ready;
    }
    return run();
  }

  async put(bytes: Buffer): Promise<string> {
    const digest = crypto.createHash('sha256').update(bytes).digest();
    const hash = digest.toString('hex');
    if (await this.has(hash)) return hash;
    // Two processes storing the same photo at once write the same bytes under the same name: harmless.
    await this.send(() =>
      this.client.send(
        new PutObjectCommand({
          Bucket: this.options.bucket,
          Key: this.keyOf(hash),
          Body: bytes,
          ContentLength: bytes.length,
          ContentType: 'application/octet-stream',
          ChecksumSHA256: digest.toString('base64'),
        }),
      ),
    );
    return hash;
  }

  async get(hash: string): Promise<Buffer> {
    const key = this.keyOf(hash);
    let bytes: Buffer;
    try {
      const answer = await this.send(() => this.client.send(new GetObjectCommand({ Bucket: this.options.bucket, Key: key })));
      if (!answer.Body) throw new ImageNotFoundError(hash);
      bytes = Buffer.from(await answer.Body.transformToByteArray());
    } catch (err) {
      if (isMissing(err)) throw new ImageNotFoundError(hash);
      throw err;
    }
    if (crypto.createHash('sha256').update(bytes).digest('hex') !== hash) throw new DamagedImageError(hash);
    return bytes;
  }

  async has(hash: string): Promise<boolean> {
    if (!HASH_PATTERN.test(hash)) return false;
    const key = this.keyOf(hash);
    try {
      await this.send(() => this.client.send(new HeadObjectCommand({ Bucket: this.options.bucket, Key: key })));
      return true;
    } catch (err) {
      if (isMissing(err)) return false;
      throw err;
    }
  }

  async *list(skipped: (name: string) => void = () => undefined): AsyncIterable<string> {
    for await (const keys of this.options.markerListing ? this.pagesByMarker() : this.pagesByToken()) {
      for (const key of keys) {
        if (HASH_PATTERN.test(key)) yield key;
        else skipped(key);
      }
    }
  }

  private async *pagesByToken(): AsyncGenerator<string[]> {
    let continuationToken: string | undefined;
    do {
      const page = await this.send(() =>
        this.client.send(new ListObjectsV2Command({ Bucket: this.options.bucket, ContinuationToken: continuationToken, MaxKeys: this.options.listPageSize })),
      );
      yield keysOf(page.Contents);
      // A truncated page without a token would end the listing early and silently: a backup must not.
      if (page.IsTruncated && !page.NextContinuationToken) throw new Error(`The listing of bucket ${this.options.bucket} was cut short without a continuation token`);
      continuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (continuationToken);
  }

  private async *pagesByMarker(): AsyncGenerator<string[]> {
    let marker: string | undefined;
    let truncated: boolean | undefined;
    do {
      const page = await this.send(() => this.client.send(new ListObjectsCommand({ Bucket: this.options.bucket, Marker: marker, MaxKeys: this.options.listPageSize })));
      const keys = keysOf(page.Contents);
      yield keys;
      truncated = page.IsTruncated;
      if (truncated && keys.length === 0) throw new Error(`The listing of bucket ${this.options.bucket} was cut short: a truncated page named no key`);
      marker = keys[keys.length - 1];
    } while (truncated);
  }
}

function keysOf(contents: { Key?: string }[] | undefined): string[] {
  return (contents ?? []).flatMap((object) => (object.Key === undefined ? [] : [object.Key]));
}
