import type TestAgent from 'supertest/lib/agent';
import { deliverableSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { STORAGE_RETRY_AFTER_SECONDS } from '../../apps/server/src/storage';
import { testApp, type TestApp } from '../support/app';
import { signedInAs } from '../support/agents';
import { tinyPdf } from '../support/fakes';
import { xsrfToken } from '../support/identity';

jest.setTimeout(60_000);

describe('when file storage goes down, uploads and downloads say so with 503 and work again once it is back', () => {
  let t: TestApp;
  let tomas: TestAgent;
  const kestrel = DEMO.projects.kestrel.id;
  const upload = (name: string) =>
    tomas
      .post(`/api/projects/${kestrel}/stages/beam_framing/deliverables`)
      .set('X-XSRF-TOKEN', xsrfToken(tomas))
      .attach('file', tinyPdf(name), { filename: name, contentType: 'application/pdf' });

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
  });
  afterAll(async () => {
    await t.s3.resume();
    await t.close();
  });

  it('answers 503 with Retry-After while the S3 fake is stopped, records nothing, and recovers', async () => {
    const before = await upload('Before outage.pdf');
    expect(before.status).toBe(201);
    const stored = deliverableSchema.parse(before.body);

    await t.s3.halt();
    try {
      const refused = await upload('During outage.pdf');
      expect(refused.status).toBe(503);
      expect(refused.headers['retry-after']).toBe(String(STORAGE_RETRY_AFTER_SECONDS));
      expect(refused.body.error).toMatchObject({
        code: 'service_unavailable',
        message: expect.stringMatching(/file storage is unavailable/i),
      });
      expect(await t.db('deliverables').where({ file_name: 'During outage.pdf' }).first()).toBeUndefined();

      const download = await tomas.get(stored.downloadUrl);
      expect(download.status).toBe(503);
      expect(download.headers['retry-after']).toBe(String(STORAGE_RETRY_AFTER_SECONDS));
      expect(download.body.error.code).toBe('service_unavailable');
    } finally {
      await t.s3.resume();
    }

    const after = await upload('After outage.pdf');
    expect(after.status).toBe(201);
    const again = await tomas.get(stored.downloadUrl);
    expect(again.status).toBe(200);
    expect(again.headers['x-content-sha256']).toBe(stored.sha256);
  });
});
