import { DeleteObjectCommand, GetObjectCommand, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import type { BlobStore } from './types';
import { assertBlobKey } from './keys';

export interface S3StoreOptions {
  bucket: string;
  region: string;
  /** An S3-compatible service's address; left out, the SDK talks to AWS itself. */
  endpoint?: string;
  forcePathStyle: boolean;
  /** Left out, the SDK's own chain applies (AWS_* variables, instance roles). */
  credentials?: { accessKeyId: string; secretAccessKey: string };
}

export function createS3BlobStore(o: S3StoreOptions): BlobStore & { client: S3Client } {
  const client = new S3Client({
    region: o.region,
    endpoint: o.endpoint,
    forcePathStyle: o.forcePathStyle,
    credentials: o.credentials,
    // Many S3-compatible services refuse the newer default checksum headers; TLS and the
    // signed payload hash already protect the bytes in transit.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const Bucket = o.bucket;
  return {
    client,
    async put(key, bytes, contentType) {
      assertBlobKey(key);
      await client.send(new PutObjectCommand({ Bucket, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.length }));
    },
    async get(key) {
      assertBlobKey(key);
      try {
        const out = await client.send(new GetObjectCommand({ Bucket, Key: key }));
        if (!out.Body) return null;
        return Buffer.from(await out.Body.transformToByteArray());
      } catch (e) {
        if (e instanceof S3ServiceException && (e.name === 'NoSuchKey' || e.$metadata.httpStatusCode === 404)) return null;
        throw e;
      }
    },
    async delete(key) {
      assertBlobKey(key);
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
  };
}
