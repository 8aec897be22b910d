import { Readable } from 'node:stream';
import { CreateMultipartUploadCommand, S3Client, UploadPartCommand } from '@aws-sdk/client-s3';
import { createJobs, type Jobs } from '../../apps/server/src/jobs';
import type { Db } from '../../apps/server/src/db/db';
import { pruneExpired } from '../../apps/server/src/maintenance/prune';
import {
  sweepIncompleteUploads,
  UPLOAD_SWEEP_CRON,
  UPLOAD_SWEEP_JOB,
} from '../../apps/server/src/maintenance/sweep-uploads';
import { FAKE_S3_CREDENTIALS } from '../../scripts/fakes/s3';
import { freshDatabase } from '../support/database';
import { fakeObjectStore } from '../support/fakes';

describe('pruning expired rows', () => {
  let db: Db;
  let url: string;
  let drop: () => Promise<void>;
  beforeAll(async () => {
    ({ db, url, drop } = await freshDatabase());
  });
  afterAll(() => drop());

  it('deletes expired sessions, spent rate-limit windows and expired provider records, and keeps the live ones', async () => {
    const past = new Date(Date.now() - 60_000);
    const future = new Date(Date.now() + 3_600_000);
    await db('sessions').insert([
      { sid: 'old', sess: JSON.stringify({ cookie: {} }), expire: past },
      { sid: 'live', sess: JSON.stringify({ cookie: {} }), expire: future },
    ]);
    await db('rate_limits').insert([
      { key: 'sign-in:old', hits: 3, reset_at: past },
      { key: 'sign-in:live', hits: 1, reset_at: future },
    ]);
    await db('identity_payloads').insert([
      { model: 'Session', id: 'old', payload: '{}', expires_at: past },
      { model: 'Session', id: 'live', payload: '{}', expires_at: future },
      { model: 'Client', id: 'forever', payload: '{}', expires_at: null },
    ]);

    await expect(pruneExpired(db)).resolves.toEqual({ sessions: 1, rateLimits: 1, identityPayloads: 1 });
    expect((await db('sessions').pluck('sid')).sort()).toEqual(['live']);
    expect(await db('rate_limits').pluck('key')).toEqual(['sign-in:live']);
    expect((await db('identity_payloads').pluck('id')).sort()).toEqual(['forever', 'live']);
    await expect(pruneExpired(db)).resolves.toEqual({ sessions: 0, rateLimits: 0, identityPayloads: 0 });
  });

  it('is scheduled in PostgreSQL once, however many API processes register it', async () => {
    const a: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    const b: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    try {
      await a.start();
      await b.start();
      const handler = async () => undefined;
      await a.every('maintenance.prune', '*/10 * * * *', handler);
      await b.every('maintenance.prune', '*/10 * * * *', handler);
      const schedules = await a.boss.getSchedules();
      expect(schedules.filter((s) => s.name === 'maintenance.prune')).toEqual([
        expect.objectContaining({ name: 'maintenance.prune', cron: '*/10 * * * *', timezone: 'UTC' }),
      ]);
    } finally {
      await a.stop();
      await b.stop();
    }
  });
});

describe('sweeping incomplete uploads', () => {
  let files: Awaited<ReturnType<typeof fakeObjectStore>>;
  let client: S3Client;
  beforeAll(async () => {
    files = await fakeObjectStore();
    client = new S3Client({
      endpoint: files.s3.endpoint,
      region: 'us-east-1',
      credentials: { ...FAKE_S3_CREDENTIALS },
      forcePathStyle: true,
      requestChecksumCalculation: 'WHEN_REQUIRED',
    });
  });
  afterAll(async () => {
    client.destroy();
    await files.close();
  });

  /** What a process that died mid-upload leaves: a begun multipart upload with one part stored. */
  async function abandonedUpload(key: string): Promise<string> {
    const Bucket = files.s3.bucket;
    const { UploadId } = await client.send(new CreateMultipartUploadCommand({ Bucket, Key: key }));
    await client.send(
      new UploadPartCommand({ Bucket, Key: key, UploadId, PartNumber: 1, Body: Buffer.alloc(64 * 1024, 0x42) }),
    );
    return UploadId!;
  }

  it('aborts uploads begun more than a day ago, frees their parts, and leaves younger ones and finished files', async () => {
    const a = await abandonedUpload('projects/p1/stages/beam_framing/abandoned-a');
    const b = await abandonedUpload('projects/p2/stages/foundations/abandoned-b');
    await files.store.putStream('projects/p1/kept.pdf', Readable.from([Buffer.from('%PDF-1.4\n')]), {
      contentType: 'application/pdf',
    });
    expect((await files.store.listIncompleteUploads()).map((u) => u.uploadId).sort()).toEqual([a, b].sort());
    expect((await files.s3.pendingUploads()).map((u) => u.parts)).toEqual([1, 1]);

    const hour = 3_600_000;
    // 23 hours on: too young to be called abandoned.
    await expect(sweepIncompleteUploads(files.store, new Date(Date.now() + 23 * hour))).resolves.toEqual({
      aborted: 0,
      kept: 2,
    });
    expect(await files.s3.pendingUploads()).toHaveLength(2);

    // 25 hours on: both go, parts and all; the finished file stays.
    await expect(sweepIncompleteUploads(files.store, new Date(Date.now() + 25 * hour))).resolves.toEqual({
      aborted: 2,
      kept: 0,
    });
    expect(await files.s3.pendingUploads()).toEqual([]);
    expect(await files.store.listIncompleteUploads()).toEqual([]);
    expect(await files.store.head('projects/p1/kept.pdf')).toMatchObject({ size: 9 });
    // Aborting one that is already gone is not an error (two sweeps racing, say).
    await expect(files.store.abortUpload('projects/p1/stages/beam_framing/abandoned-a', a)).resolves.toBeUndefined();
  });

  it('a part sent for an upload that was aborted is refused and does not bring the upload back', async () => {
    const key = 'projects/p3/late-part';
    const id = await abandonedUpload(key);
    await files.store.abortUpload(key, id);
    await expect(
      client.send(
        new UploadPartCommand({
          Bucket: files.s3.bucket,
          Key: key,
          UploadId: id,
          PartNumber: 2,
          Body: Buffer.from('x'),
        }),
      ),
    ).rejects.toMatchObject({ name: 'NoSuchUpload' });
    expect(await files.s3.pendingUploads()).toEqual([]);
  });

  it('is scheduled in PostgreSQL once, however many API processes register it', async () => {
    const { url, drop } = await freshDatabase();
    const a: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    const b: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    try {
      await a.start();
      await b.start();
      const handler = async () => undefined;
      await a.every(UPLOAD_SWEEP_JOB, UPLOAD_SWEEP_CRON, handler);
      await b.every(UPLOAD_SWEEP_JOB, UPLOAD_SWEEP_CRON, handler);
      const schedules = await a.boss.getSchedules();
      expect(schedules.filter((s) => s.name === UPLOAD_SWEEP_JOB)).toEqual([
        expect.objectContaining({ name: 'maintenance.sweep-uploads', cron: UPLOAD_SWEEP_CRON, timezone: 'UTC' }),
      ]);
    } finally {
      await a.stop();
      await b.stop();
      await drop();
    }
  });
});
