import path from 'node:path';
import { S3Client } from '@aws-sdk/client-s3';
import type { Config, S3Settings } from '../../config';
import { ensureFakeS3, FAKE_S3_CREDENTIALS } from '../fake-s3';
import type { ImageStore } from './image-store';
import { LocalImageStore } from './local-store';
import { S3ImageStore } from './s3-store';

/** Where the stand-in S3 server keeps its objects. */
export function standInDir(config: Pick<Config, 'dataDir'>): string {
  return path.join(config.dataDir, 's3');
}

/** An S3 client for the settings; credentials come from the SDK's usual chain (AWS_ACCESS_KEY_ID...) unless given. */
export function s3ClientFor(s3: S3Settings, credentials?: { accessKeyId: string; secretAccessKey: string }): S3Client {
  return new S3Client({
    endpoint: s3.endpoint ?? `http://127.0.0.1:${s3.standInPort}`,
    region: s3.region,
    forcePathStyle: s3.pathStyle || s3.endpoint === null,
    credentials,
  });
}

/**
 * The image store the settings ask for: the local folder, or the S3 bucket (KW_STORAGE=s3). Without
 * KW_S3_ENDPOINT the bucket lives in a stand-in server on loopback, started on first use.
 */
export function openImageStore(config: Config): ImageStore {
  const s3 = config.s3;
  if (!s3) {
    const local = new LocalImageStore(config.imageDir);
    // Half-written files from a process that died mid-write; a failure here must not stop the server.
    void local.removeLeftovers().catch(() => undefined);
    return local;
  }
  if (s3.endpoint !== null) return new S3ImageStore(s3ClientFor(s3), { bucket: s3.bucket });
  return new S3ImageStore(s3ClientFor(s3, FAKE_S3_CREDENTIALS), {
    bucket: s3.bucket,
    markerListing: true,
    beforeFirstUse: async () => {
      await ensureFakeS3({ port: s3.standInPort, dir: standInDir(config), bucket: s3.bucket });
    },
  });
}
