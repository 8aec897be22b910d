import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { objectStoreConfigFrom, storageConfigSchema, type ObjectStore } from '../../apps/server/src/storage';
import { generatedSha256, pdfLikeStream } from '../../scripts/bench/lib/generate';
import type { FakeS3 } from '../../scripts/fakes/s3';
import { fakeObjectStore } from '../support/fakes';

describe('object store against the local S3 fake', () => {
  let store: ObjectStore;
  let s3: FakeS3;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ store, s3, close } = await fakeObjectStore());
  });
  afterAll(() => close());

  async function sha256Of(body: Readable): Promise<{ sha256: string; size: number }> {
    const hash = createHash('sha256');
    let size = 0;
    for await (const chunk of body) {
      hash.update(chunk as Buffer);
      size += (chunk as Buffer).length;
    }
    return { sha256: hash.digest('hex'), size };
  }

  it('when a multi-part file is streamed in and read back, every byte is the same (no chunk framing stored)', async () => {
    // 21 MiB + 7 bytes: three 8 MiB parts, the last one short, none a round size.
    const bytes = 21 * 1024 * 1024 + 7;
    const expected = await generatedSha256(bytes, 7);
    await store.putStream('roundtrip/big.pdf', pdfLikeStream(bytes, 7), { contentType: 'application/pdf' });

    const got = await store.getStream('roundtrip/big.pdf');
    expect(got.contentLength).toBe(bytes);
    expect(got.contentType).toBe('application/pdf');
    expect(await sha256Of(got.body)).toEqual({ sha256: expected, size: bytes });
    expect(await store.head('roundtrip/big.pdf')).toMatchObject({ size: bytes });
  });

  it('when a small file goes up as one request, it also reads back byte for byte', async () => {
    const data = Buffer.from('%PDF-1.4\nshort deliverable\n%%EOF\n');
    await store.putStream('roundtrip/small.pdf', Readable.from([data]), { contentType: 'application/pdf' });
    const got = await store.getStream('roundtrip/small.pdf');
    expect((await sha256Of(got.body)).sha256).toBe(createHash('sha256').update(data).digest('hex'));
    expect(await store.readRange('roundtrip/small.pdf', 1, 4)).toEqual(Buffer.from('PDF'));
  });

  it('a signed link downloads the object under the name given, and stops working once it expires', async () => {
    await store.putStream('links/plan.pdf', Readable.from([Buffer.from('%PDF-1.4\nplan\n')]), {
      contentType: 'application/pdf',
    });
    const url = await store.signedGetUrl('links/plan.pdf', 60, 'Ground floor — columns.pdf');
    expect(url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/trabeate\/links\/plan\.pdf\?/);
    const res = await fetch(url);
    expect(res.status).toBe(200);
    expect(await res.text()).toBe('%PDF-1.4\nplan\n');
    const disposition = res.headers.get('content-disposition') ?? '';
    expect(disposition).toContain('attachment');
    expect(disposition).toContain("filename*=UTF-8''Ground%20floor%20%E2%80%94%20columns.pdf");

    const expired = await store.signedGetUrl('links/plan.pdf', 1);
    await new Promise((r) => setTimeout(r, 2100));
    expect((await fetch(expired)).status).toBe(403);
  });

  it('when an upload is aborted half-way, no object is left behind', async () => {
    const controller = new AbortController();
    const body = pdfLikeStream(30 * 1024 * 1024);
    let sent = 0;
    body.on('data', (c: Buffer) => {
      sent += c.length;
      if (sent > 10 * 1024 * 1024 && !controller.signal.aborted) controller.abort();
    });
    await expect(
      store.putStream('aborted/big.pdf', body, { contentType: 'application/pdf', signal: controller.signal }),
    ).rejects.toThrow();
    expect(await store.head('aborted/big.pdf')).toBeNull();
    expect(await store.list('aborted/')).toEqual([]);
    // The multipart upload itself is aborted: no part files are left in the fake's folder.
    expect(await s3.pendingUploads()).toEqual([]);
    expect(await store.listIncompleteUploads()).toEqual([]);
  });

  it('a key with a segment over 255 bytes is refused with an S3 error, and the fake keeps serving', async () => {
    // 90 CJK characters: 270 bytes in UTF-8, more than a file name on disk may hold.
    const key = `long/${'梁'.repeat(90)}.pdf`;
    await expect(
      store.putStream(key, Readable.from([Buffer.from('%PDF-1.4\n')]), { contentType: 'application/pdf' }),
    ).rejects.toMatchObject({ name: 'KeyTooLongError' });
    await store.putStream('long/after.pdf', Readable.from([Buffer.from('%PDF-1.4\n')]), {
      contentType: 'application/pdf',
    });
    expect(await store.head('long/after.pdf')).toMatchObject({ size: 9 });
  });

  it('removing an object makes it disappear, and removing it again is not an error', async () => {
    await store.putStream('gone/a.txt', Readable.from([Buffer.from('x')]), { contentType: 'text/plain' });
    expect(await store.list('gone/')).toHaveLength(1);
    await store.remove('gone/a.txt');
    await store.remove('gone/a.txt');
    expect(await store.head('gone/a.txt')).toBeNull();
  });

  it('ensureBucket is safe to call on an existing bucket', async () => {
    await expect(store.ensureBucket()).resolves.toBeUndefined();
  });
});

describe('storage configuration fragment', () => {
  it('treats an empty endpoint as real AWS and needs both keys or neither', () => {
    const parsed = storageConfigSchema.parse({ S3_ENDPOINT: '', S3_BUCKET: 'firm-files' });
    expect(objectStoreConfigFrom(parsed)).toEqual({
      endpoint: undefined,
      region: 'us-east-1',
      bucket: 'firm-files',
      credentials: undefined,
      forcePathStyle: false,
    });
    expect(parsed.UPLOAD_MAX_BYTES).toBe(1024 ** 3);
    expect(storageConfigSchema.safeParse({ S3_ACCESS_KEY_ID: 'only-one' }).success).toBe(false);
    expect(storageConfigSchema.safeParse({ S3_ENDPOINT: 'not a url' }).success).toBe(false);
    const local = storageConfigSchema.parse({
      S3_ENDPOINT: 'http://127.0.0.1:4312',
      S3_ACCESS_KEY_ID: 'a',
      S3_SECRET_ACCESS_KEY: 'b',
      S3_FORCE_PATH_STYLE: 'true',
      UPLOAD_MAX_BYTES: '5000',
    });
    expect(objectStoreConfigFrom(local)).toMatchObject({
      endpoint: 'http://127.0.0.1:4312',
      credentials: { accessKeyId: 'a', secretAccessKey: 'b' },
      forcePathStyle: true,
    });
    expect(local.UPLOAD_MAX_BYTES).toBe(5000);
  });
});
