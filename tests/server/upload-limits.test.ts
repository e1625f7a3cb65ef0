import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Sweep } from '../../server/models';
import { logSpacedHz, predictedSweepCsv, testDesignInput } from '../helpers/bench-fixtures';
import { startTestApp, type TestApp } from '../helpers/test-app';

// A server with a small upload limit, so the refusal can be tested without a 50 MB file.
const limitBytes = 2000;
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ env: { UPLOAD_SWEEP_MAX_BYTES: String(limitBytes), UPLOAD_CAPTURE_MAX_BYTES: String(limitBytes) } });
});
afterAll(async () => {
  await app?.close();
});

describe('upload size limits', () => {
  it('refuses a sweep file over the limit with 413, stating the limit, and stores nothing', async () => {
    const designer = request.agent(app.url).set('Origin', app.origin);
    await designer.post('/api/auth/sign-in').send({ email: 'designer@rejectra.test', password: 'bench-demo' }).expect(200);
    const design = (await designer.post('/api/designs').send(testDesignInput('Limit board'))).body.design;
    const session = await designer.post('/api/sessions').send({
      designRevisionId: design.revisions[0].id,
      unitSerial: 'HRB204-0901',
      fixture: 'BF-2',
      differentialDrive: { acVolts: 0.1, acConvention: 'rms' },
      commonModeDrive: { acVolts: 1, acConvention: 'rms' },
    });
    const sessionId = session.body.session.id as string;
    const big = predictedSweepCsv({ mismatch: 0.001, frequenciesHz: logSpacedHz(200, 10, 100_000) }).differential;
    expect(big.length).toBeGreaterThan(limitBytes);
    const refused = await designer.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential').attach('file', Buffer.from(big), 'big.csv');
    expect(refused.status).toBe(413);
    expect(refused.body.error).toBe(`The file in "file" is larger than the ${limitBytes} bytes allowed per file`);
    const captures = await designer
      .post(`/api/sessions/${sessionId}/captures`)
      .field('tags', JSON.stringify([{ file: 'big.csv', mode: 'differential', frequencyHz: 1000 }]))
      .attach('files', Buffer.from(big), 'big.csv');
    expect(captures.status).toBe(413);
    expect(await Sweep.count({ where: { benchSessionId: sessionId } })).toBe(0);
  });
});
