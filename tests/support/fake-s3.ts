import { createHash, createHmac } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';

/**
 * A small S3-compatible server on 127.0.0.1 for tests: path-style PutObject, GetObject and
 * DeleteObject on one bucket, in memory. It checks AWS Signature Version 4 the way S3 does, so a
 * test through the real SDK also proves the endpoint, region and credentials are wired right.
 */
export interface FakeS3 {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  objects: Map<string, { body: Buffer; contentType: string }>;
  requests: { method: string; key: string; status: number }[];
  close(): Promise<void>;
}

const sha256 = (data: string | Buffer) => createHash('sha256').update(data).digest('hex');
const hmac = (key: string | Buffer, data: string) => createHmac('sha256', key).update(data).digest();
// RFC 3986 unreserved characters stay; everything else is percent-encoded, as SigV4 asks.
const rfc3986 = (s: string) => encodeURIComponent(s).replace(/[!'()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);

function xmlError(res: ServerResponse, status: number, code: string, message: string) {
  res.writeHead(status, { 'content-type': 'application/xml' });
  res.end(`<?xml version="1.0" encoding="UTF-8"?><Error><Code>${code}</Code><Message>${message}</Message></Error>`);
}

function readBody(req: IncomingMessage): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => resolve(Buffer.concat(chunks)));
    req.on('error', reject);
  });
}

/** The AWS SigV4 check: rebuild the canonical request and compare signatures. Returns an S3 error code or null. */
function checkSignature(req: IncomingMessage, body: Buffer, s3: Pick<FakeS3, 'accessKeyId' | 'secretAccessKey' | 'region'>): string | null {
  const auth = req.headers.authorization ?? '';
  const m = /^AWS4-HMAC-SHA256 Credential=([^/]+)\/(\d{8})\/([^/]+)\/s3\/aws4_request, ?SignedHeaders=([^,]+), ?Signature=([0-9a-f]{64})$/.exec(auth);
  if (!m) return 'AccessDenied';
  const [, keyId, date, region, signedHeaders, signature] = m;
  if (keyId !== s3.accessKeyId) return 'InvalidAccessKeyId';
  if (region !== s3.region) return 'AuthorizationHeaderMalformed';
  const payloadHash = String(req.headers['x-amz-content-sha256'] ?? '');
  if (payloadHash !== 'UNSIGNED-PAYLOAD' && payloadHash !== sha256(body)) return 'XAmzContentSHA256Mismatch';
  const [rawPath, rawQuery = ''] = (req.url ?? '/').split('?');
  const query = rawQuery
    .split('&')
    .filter(Boolean)
    .map((p) => p.split('=').map((x) => rfc3986(decodeURIComponent(x ?? ''))))
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([k, v = '']) => `${k}=${v}`)
    .join('&');
  const names = signedHeaders.split(';');
  const headers = names.map((n) => `${n}:${String(req.headers[n] ?? '').trim().replace(/\s+/g, ' ')}\n`).join('');
  const canonical = [req.method, rawPath, query, headers, signedHeaders, payloadHash].join('\n');
  const amzDate = String(req.headers['x-amz-date'] ?? '');
  const toSign = ['AWS4-HMAC-SHA256', amzDate, `${date}/${region}/s3/aws4_request`, sha256(canonical)].join('\n');
  const key = hmac(hmac(hmac(hmac(`AWS4${s3.secretAccessKey}`, date), region), 's3'), 'aws4_request');
  return createHmac('sha256', key).update(toSign).digest('hex') === signature ? null : 'SignatureDoesNotMatch';
}

export async function startFakeS3(opts: Partial<Pick<FakeS3, 'bucket' | 'region' | 'accessKeyId' | 'secretAccessKey'>> = {}): Promise<FakeS3> {
  const s3 = {
    bucket: opts.bucket ?? 'lashline-test',
    region: opts.region ?? 'eu-west-2',
    accessKeyId: opts.accessKeyId ?? 'TESTKEYID',
    secretAccessKey: opts.secretAccessKey ?? 'test-secret-key',
    objects: new Map<string, { body: Buffer; contentType: string }>(),
    requests: [] as FakeS3['requests'],
  };
  const handle = async (req: IncomingMessage, res: ServerResponse) => {
    const body = await readBody(req);
    const path = (req.url ?? '/').split('?')[0];
    const [, bucket = '', ...rest] = path.split('/');
    const key = decodeURIComponent(rest.join('/'));
    const reply = (status: number) => s3.requests.push({ method: req.method ?? '', key, status });
    const failed = checkSignature(req, body, s3);
    if (failed) return reply(403), xmlError(res, 403, failed, 'The request signature is not right.');
    if (bucket !== s3.bucket) return reply(404), xmlError(res, 404, 'NoSuchBucket', 'The bucket does not exist.');
    if (!key) return reply(501), xmlError(res, 501, 'NotImplemented', 'Only object requests are served.');
    const found = s3.objects.get(key);
    switch (req.method) {
      case 'PUT':
        s3.objects.set(key, { body, contentType: String(req.headers['content-type'] ?? 'application/octet-stream') });
        reply(200);
        return res.writeHead(200, { etag: `"${createHash('md5').update(body).digest('hex')}"` }).end();
      case 'GET':
        if (!found) return reply(404), xmlError(res, 404, 'NoSuchKey', 'The key does not exist.');
        reply(200);
        return res
          .writeHead(200, { 'content-type': found.contentType, 'content-length': found.body.length, etag: `"${createHash('md5').update(found.body).digest('hex')}"` })
          .end(found.body);
      case 'DELETE':
        s3.objects.delete(key);
        reply(204);
        return res.writeHead(204).end();
      default:
        reply(501);
        return xmlError(res, 501, 'NotImplemented', `${req.method} is not served here.`);
    }
  };
  const server = createServer((req, res) => {
    handle(req, res).catch(() => xmlError(res, 500, 'InternalError', 'The fake failed.'));
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    ...s3,
    endpoint: `http://127.0.0.1:${port}`,
    close: () => new Promise<void>((resolve, reject) => server.close((e) => (e ? reject(e) : resolve()))),
  };
}
