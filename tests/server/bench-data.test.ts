import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Sweep } from '../../server/models';
import { logSpacedHz, predictedSweepCsv, testDesignInput } from '../helpers/bench-fixtures';
import { startTestApp, type TestApp } from '../helpers/test-app';

// CMRR values are compared with the engine's own prediction of the same circuit (the engine
// itself is checked against ngspice in tests/shared/engine); 1e-6 dB is float noise after the
// sweep file's 17-significant-digit round trip.
const cmrrToleranceDb = 1e-6;
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp();
});
afterAll(async () => {
  await app?.close();
});

async function signedIn(email: string) {
  const session = request.agent(app.url).set('Origin', app.origin);
  await session.post('/api/auth/sign-in').send({ email, password: 'bench-demo' }).expect(200);
  return session;
}

const drive = (acVolts: number, dcVolts = 0) => ({ acVolts, acConvention: 'rms' as const, dcVolts });

async function newDesign(name: string) {
  const designer = await signedIn('designer@rejectra.test');
  const created = await designer.post('/api/designs').send(testDesignInput(name));
  expect(created.status).toBe(201);
  return created.body.design as { id: string; revisions: { id: string; revision: number }[] };
}

async function newSession(revisionId: string, email = 'tech@rejectra.test', overrides: Record<string, unknown> = {}) {
  const technician = await signedIn(email);
  const created = await technician.post('/api/sessions').send({
    designRevisionId: revisionId,
    unitSerial: 'HRB204-0101',
    fixture: 'Bridge fixture BF-2',
    ambientTemperatureC: 23.1,
    differentialDrive: drive(0.1),
    commonModeDrive: drive(1),
    ...overrides,
  });
  return { technician, created };
}

describe('designs', () => {
  it('lets a designer create a design and edit it into a new revision, keeping the old one', async () => {
    const design = await newDesign('Bridge board A');
    expect(design.revisions).toHaveLength(1);
    const designer = await signedIn('designer@rejectra.test');
    const edit = testDesignInput().revision;
    edit.label = 'B';
    const tighter = { ...edit, circuit: { ...edit.circuit, r1: { ohms: 1000, tolerance: 0.0001 } } } as typeof edit;
    const revised = await designer.post(`/api/designs/${design.id}/revisions`).send(tighter);
    expect(revised.status).toBe(201);
    expect(revised.body.revision.revision).toBe(2);
    const detail = await designer.get(`/api/designs/${design.id}`);
    expect(detail.body.design.revisions.map((revision: { label: string }) => revision.label)).toEqual(['B', 'A']);
    expect(detail.body.design.revisions[1].circuit.r1.tolerance).toBe(0.001);
  });

  it('refuses a technician creating a design, a duplicate name and a malformed mask, naming the fields', async () => {
    const technician = await signedIn('tech@rejectra.test');
    expect((await technician.post('/api/designs').send(testDesignInput('x'))).status).toBe(403);
    const designer = await signedIn('designer@rejectra.test');
    await designer.post('/api/designs').send(testDesignInput('Only once')).expect(201);
    const duplicate = await designer.post('/api/designs').send(testDesignInput('Only once'));
    expect(duplicate.status).toBe(409);
    const input = testDesignInput('Bad mask');
    input.revision.limitMask = { points: [{ frequencyHz: 1000, minimumCmrrDb: 60 }, { frequencyHz: 100, minimumCmrrDb: 50 }] };
    (input.revision.circuit as { r2: { ohms: number; tolerance: number } }).r2 = { ohms: -5, tolerance: 0.7 };
    const bad = await designer.post('/api/designs').send(input);
    expect(bad.status).toBe(400);
    expect(bad.body.fields['revision.limitMask.points']).toMatch(/rise strictly/);
    expect(bad.body.fields['revision.circuit.r2.ohms']).toBe('Resistance must be above zero');
    expect(bad.body.fields['revision.circuit.r2.tolerance']).toMatch(/between 0 and 0.5/);
  });
});

describe('instruments', () => {
  it('lets a lead list instruments with their calibration state, and refuses a technician adding one', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const added = await lead.post('/api/instruments').send({
      name: 'Lock-in LI-3', kind: 'lock-in amplifier', manufacturer: 'Halden Ridge', model: 'LI-3', serialNumber: 'LI3-00412',
      calibratedOn: '2020-01-10', calibrationDueOn: '2021-01-10',
    });
    expect(added.status).toBe(201);
    expect(added.body.instrument.calibrationState).toBe('overdue');
    const duplicate = await lead.post('/api/instruments').send({ name: 'Again', kind: 'other', manufacturer: 'x', model: 'y', serialNumber: 'LI3-00412' });
    expect(duplicate.status).toBe(409);
    const technician = await signedIn('tech@rejectra.test');
    expect((await technician.post('/api/instruments').send({ name: 'x', kind: 'other', manufacturer: 'x', model: 'y', serialNumber: 'z' })).status).toBe(403);
    expect((await technician.get('/api/instruments')).body.instruments.length).toBeGreaterThan(0);
  });
});

describe('bench sessions', () => {
  it('refuses a hazardous common-mode drive until the caution is acknowledged, and records the acknowledgement', async () => {
    const design = await newDesign('Current sense board');
    // 48 V dc rail plus a 20 V rms tone: peak 76 V, above the 60 V threshold (DOMAIN.md, Safety).
    const { created } = await newSession(design.revisions[0].id, 'tech@rejectra.test', { commonModeDrive: drive(20, 48) });
    expect(created.status).toBe(400);
    expect(created.body.fields.hazardAcknowledged).toMatch(/hazardous live/);
    const acknowledged = await newSession(design.revisions[0].id, 'tech@rejectra.test', { commonModeDrive: drive(20, 48), hazardAcknowledged: true });
    expect(acknowledged.created.status).toBe(201);
    expect(acknowledged.created.body.session.hazardousDrive).toBe(true);
    expect(await AuditEvent.count({ where: { action: 'hazard-acknowledged', subjectId: acknowledged.created.body.session.id } })).toBe(1);
  });

  it('pages, sorts and filters the session list on the server', async () => {
    const design = await newDesign('Paging board');
    for (const serial of ['HRB204-0301', 'HRB204-0303', 'HRB204-0302']) {
      expect((await newSession(design.revisions[0].id, 'tech@rejectra.test', { unitSerial: serial })).created.status).toBe(201);
    }
    const lead = await signedIn('lead@rejectra.test');
    const page = await lead.get(`/api/sessions?designId=${design.id}&sort=unitSerial&direction=asc&pageSize=2&page=1`);
    expect(page.status).toBe(200);
    expect(page.body.total).toBe(3);
    expect(page.body.items.map((item: { unitSerial: string }) => item.unitSerial)).toEqual(['HRB204-0301', 'HRB204-0302']);
    const second = await lead.get(`/api/sessions?designId=${design.id}&sort=unitSerial&direction=asc&pageSize=2&page=2`);
    expect(second.body.items.map((item: { unitSerial: string }) => item.unitSerial)).toEqual(['HRB204-0303']);
    const search = await lead.get(`/api/sessions?search=0302`);
    expect(search.body.items.map((item: { unitSerial: string }) => item.unitSerial)).toEqual(['HRB204-0302']);
    const byDesign = await lead.get(`/api/sessions?search=${encodeURIComponent('paging BOARD')}`);
    expect(byDesign.body.total).toBe(3);
    const byOperator = await lead.get(`/api/sessions?search=Halvorsen&designId=${design.id}`);
    expect(byOperator.body.total).toBe(3);
    expect((await lead.get('/api/sessions?pageSize=100000')).status).toBe(400);
  });
});

describe('sweep uploads', () => {
  it('stores a canonical sweep pair and analyses it: CMRR equals the prediction of the same circuit', async () => {
    const design = await newDesign('Upload board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const frequencies = logSpacedHz(21, 10, 100_000);
    const sweeps = predictedSweepCsv({ mismatch: 0.001, frequenciesHz: frequencies });
    const differential = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential').attach('file', Buffer.from(sweeps.differential), 'd.csv');
    expect(differential.status).toBe(201);
    expect(differential.body.sweeps[0]).toMatchObject({ mode: 'differential', pointCount: 21, source: 'upload', sourceName: 'd.csv' });
    await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'common-mode').attach('file', Buffer.from(sweeps.commonMode), 'cm.csv').expect(201);

    const analysis = (await technician.get(`/api/sessions/${sessionId}/analysis`)).body.analysis;
    expect(analysis.status).toBe('complete');
    expect(analysis.points).toHaveLength(21);
    analysis.points.forEach((point: { cmrrDb: number }, index: number) => expect(Math.abs(point.cmrrDb - sweeps.cmrrDb[index])).toBeLessThan(cmrrToleranceDb));
    expect(analysis.prediction).toHaveLength(21);
    expect(analysis.limits.verdicts).toHaveLength(21);
  });

  it('maps non-canonical columns and units, and remembers the mapping for the person', async () => {
    const design = await newDesign('Mapping board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const csv = '# HRB204-0101 differential\n"Freq (kHz)";Drive (mV pk);Out (mV pk)\n0,1;141,42;1414,2\n1;141,42;1414,0\n10;141,42;1400,0\n';
    const mapping = {
      frequency: { column: 'Freq (kHz)', unit: 'kHz' },
      vin: { column: 'Drive (mV pk)', unit: 'mV', convention: 'peak' },
      vout: { column: 'Out (mV pk)', unit: 'mV', convention: 'peak' },
    };
    const upload = await technician
      .post(`/api/sessions/${sessionId}/sweeps`)
      .field('mode', 'differential')
      .field('mapping', JSON.stringify(mapping))
      .attach('file', Buffer.from(csv), 'bench-export.csv');
    expect(upload.status).toBe(201);
    expect(upload.body.sweeps[0].frequencyRangeHz).toEqual([100, 10_000]);
    const points = await technician.get(`/api/sessions/${sessionId}/sweeps/${upload.body.sweeps[0].id}/points?sort=frequencyHz`);
    // 141.42 mV peak = 0.1 V rms; the gain is the ratio 1414.2/141.42 = 10 (same convention on both).
    expect(points.body.items[0].vinV).toBeCloseTo(0.14142 / Math.SQRT2, 12);
    expect(points.body.items[0].gain).toBeCloseTo(10, 12);
    const remembered = await technician.get('/api/preferences/column-mapping');
    expect(remembered.body.columnMapping.header).toEqual(['Freq (kHz)', 'Drive (mV pk)', 'Out (mV pk)']);
  });

  it('refuses a bad file with file, row and column and leaves the session as it was', async () => {
    const design = await newDesign('Bad upload board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const before = await Sweep.count();
    const bad = await technician
      .post(`/api/sessions/${sessionId}/sweeps`)
      .field('mode', 'differential')
      .attach('file', Buffer.from('frequency_hz,vin_v,vout_v\n100,1,10\n1000,1,ten\n'), 'typo.csv');
    expect(bad.status).toBe(400);
    expect(bad.body.error).toBe('typo.csv, row 3, column "vout_v": upload: "ten" is not a number');
    const unknownHeader = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential').attach('file', Buffer.from('f,a,b\n1,2,3\n'), 'raw.csv');
    expect(unknownHeader.status).toBe(400);
    expect(unknownHeader.body.fields.mapping).toBeDefined();
    const repeated = await technician
      .post(`/api/sessions/${sessionId}/sweeps`)
      .field('mode', 'common-mode')
      .attach('file', Buffer.from('frequency_hz,vin_v,vout_v\n100,1,1e-4\n100,1,2e-4\n'), 'repeat.csv');
    expect(repeated.body.error).toMatch(/repeat\.csv, row 3, column "frequency_hz": upload: frequency 100 Hz is repeated/);
    const badMode = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'sideways').attach('file', Buffer.from('frequency_hz,vin_v,vout_v\n1,1,1\n2,1,1\n'), 'm.csv');
    expect(badMode.body.fields.mode).toBe('Mode must be differential or common-mode');
    const noFile = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential');
    expect(noFile.status).toBe(400);
    expect(await Sweep.count()).toBe(before);
  });

  it('deletes a sweep on record (who and why), only for its maker or a lead, and refuses uploads to an archived session', async () => {
    const design = await newDesign('Archive board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const sweeps = predictedSweepCsv({ mismatch: 0.002, frequenciesHz: logSpacedHz(5, 100, 10_000) });
    const upload = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential').attach('file', Buffer.from(sweeps.differential), 'd.csv');
    const sweepId = upload.body.sweeps[0].id as string;

    const designer = await signedIn('designer@rejectra.test');
    expect((await designer.delete(`/api/sessions/${sessionId}/sweeps/${sweepId}`).send({ reason: 'not mine' })).status).toBe(403);
    expect((await technician.delete(`/api/sessions/${sessionId}/sweeps/${sweepId}`).send({})).body.fields.reason).toBe('Say why the sweep is deleted');
    const deleted = await technician.delete(`/api/sessions/${sessionId}/sweeps/${sweepId}`).send({ reason: 'Wrong fixture cable' });
    expect(deleted.status).toBe(200);
    expect(deleted.body.sweep).toMatchObject({ deleteReason: 'Wrong fixture cable', deletedBy: { name: 'Ines Halvorsen' } });
    const listed = await technician.get(`/api/sessions/${sessionId}/sweeps`);
    expect(listed.body.sweeps[0].deletedAt).not.toBeNull();
    expect(await AuditEvent.count({ where: { action: 'sweep-deleted', subjectId: sweepId } })).toBe(1);

    expect((await technician.post(`/api/sessions/${sessionId}/archive`)).status).toBe(403);
    const lead = await signedIn('lead@rejectra.test');
    expect((await lead.post(`/api/sessions/${sessionId}/archive`)).body.session.status).toBe('archived');
    const refused = await technician.post(`/api/sessions/${sessionId}/sweeps`).field('mode', 'differential').attach('file', Buffer.from(sweeps.differential), 'd.csv');
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/archived/);
  });
});

describe('capture uploads', () => {
  function captureCsv(frequencyHz: number, inputAmplitude: number, gain: number, samples = 2000, sampleRateHz = 100_000) {
    const lines = ['time_s,input_v,output_v'];
    for (let index = 0; index < samples; index++) {
      const time = index / sampleRateHz;
      lines.push(`${time},${inputAmplitude * Math.cos(2 * Math.PI * frequencyHz * time)},${inputAmplitude * gain * Math.cos(2 * Math.PI * frequencyHz * time + 0.3)}`);
    }
    return Buffer.from(lines.join('\n'));
  }

  it('fits each capture and adds one point per capture to the sweep of its mode', async () => {
    const design = await newDesign('Capture board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const upload = await technician
      .post(`/api/sessions/${sessionId}/captures`)
      .field('tags', JSON.stringify([
        { file: 'd-1k.csv', mode: 'differential', frequencyHz: 1000 },
        { file: 'd-2k.csv', mode: 'differential', frequencyHz: null },
        { file: 'cm-1k.csv', mode: 'common-mode', frequencyHz: 1000 },
      ]))
      .attach('files', captureCsv(1000, 0.1, 10), 'd-1k.csv')
      .attach('files', captureCsv(2000, 0.1, 9.9), 'd-2k.csv')
      .attach('files', captureCsv(1000, 1, 3e-4), 'cm-1k.csv');
    expect(upload.status).toBe(201);
    const byMode = Object.fromEntries(upload.body.sweeps.map((sweep: { mode: string; pointCount: number }) => [sweep.mode, sweep.pointCount]));
    expect(byMode).toEqual({ differential: 2, 'common-mode': 1 });
    const differential = upload.body.sweeps.find((sweep: { mode: string }) => sweep.mode === 'differential');
    const points = await technician.get(`/api/sessions/${sessionId}/sweeps/${differential.id}/points?sort=frequencyHz`);
    // Synthetic capture with known gain 10 at an integer number of cycles: the fit recovers it exactly.
    expect(points.body.items[0].gain).toBeCloseTo(10, 9);
    expect(points.body.items[1].frequencyHz).toBeCloseTo(2000, 6);
  });

  it('refuses an untagged capture and a capture with too few cycles, naming the file, storing nothing', async () => {
    const design = await newDesign('Bad capture board');
    const { technician, created } = await newSession(design.revisions[0].id);
    const sessionId = created.body.session.id as string;
    const before = await Sweep.count();
    const untagged = await technician
      .post(`/api/sessions/${sessionId}/captures`)
      .field('tags', JSON.stringify([{ file: 'a.csv', mode: 'differential', frequencyHz: 1000 }]))
      .attach('files', captureCsv(1000, 0.1, 10), 'a.csv')
      .attach('files', captureCsv(1000, 0.1, 10), 'b.csv');
    expect(untagged.status).toBe(400);
    expect(untagged.body.error).toMatch(/b\.csv has no tag/);
    const short = await technician
      .post(`/api/sessions/${sessionId}/captures`)
      .field('tags', JSON.stringify([{ file: 'short.csv', mode: 'differential', frequencyHz: 10 }]))
      .attach('files', captureCsv(10, 0.1, 10, 200), 'short.csv');
    expect(short.status).toBe(400);
    expect(short.body.error).toMatch(/^short\.csv/);
    expect(await Sweep.count()).toBe(before);
  });
});

describe('personal access tokens', () => {
  it('shows a new token once, lists it by prefix and revokes it', async () => {
    const technician = await signedIn('tech@rejectra.test');
    const created = await technician.post('/api/tokens').send({ name: 'Bench PC 2' });
    expect(created.status).toBe(201);
    expect(created.body.token.token).toMatch(/^rjt_[A-Za-z0-9_-]{43}$/);
    const listed = await technician.get('/api/tokens');
    expect(listed.body.tokens[0]).toMatchObject({ name: 'Bench PC 2', prefix: created.body.token.token.slice(0, 10) });
    expect(listed.body.tokens[0].token).toBeUndefined();
    const revoked = await technician.delete(`/api/tokens/${created.body.token.id}`);
    expect(revoked.body.token.revokedAt).not.toBeNull();
    const lead = await signedIn('lead@rejectra.test');
    expect((await lead.delete(`/api/tokens/${created.body.token.id}`)).status).toBe(404);
  });
});

describe('thinning an analysis for drawing', () => {
  it('keeps every column extreme, the ends and the failures, aligned across points, prediction, fit and verdicts', async () => {
    const { thinAnalysis } = await import('../../server/analysis/thin-analysis');
    const count = 5000;
    const points = Array.from({ length: count }, (_, index) => ({
      frequencyHz: 10 * 10 ** ((4 * index) / (count - 1)),
      ad: 10,
      acm: 1e-4,
      // A smooth curve with one deep notch, which a thinned copy must still show.
      cmrrDb: index === 2500 ? 60 : 100 - index / 500,
      lowerBound: false,
      interpolated: false,
      commonModeLine: index + 1,
    }));
    const verdicts = points.map((point) => ({ frequencyHz: point.frequencyHz, cmrrDb: point.cmrrDb, lowerBound: false, limitDb: 70, marginDb: point.cmrrDb - 70, outcome: point.cmrrDb < 70 ? ('fail' as const) : ('pass' as const) }));
    const analysis = {
      sessionId: 's',
      status: 'complete' as const,
      message: null,
      pointCounts: { differential: count, commonMode: count },
      points,
      fit: null,
      warnings: [],
      prediction: points.map((point) => ({ frequencyHz: point.frequencyHz, adDb: 20, acmDb: -80, cmrrDb: 100, cmrrBandLowDb: 99, cmrrBandHighDb: 101 })),
      limits: { guardBandDb: 0, overall: 'fail' as const, verdicts },
      computedAt: '',
    };
    const thinned = thinAnalysis(analysis, 400);
    expect(thinned.thinnedFrom).toBe(count);
    expect(thinned.points.length).toBeLessThanOrEqual(401);
    expect(thinned.points[0]).toBe(points[0]);
    expect(thinned.points.at(-1)).toBe(points.at(-1));
    expect(thinned.points.some((point) => point.cmrrDb === 60)).toBe(true);
    thinned.points.forEach((point, index) => {
      expect(thinned.prediction[index].frequencyHz).toBe(point.frequencyHz);
      expect(thinned.limits!.verdicts[index].frequencyHz).toBe(point.frequencyHz);
    });
    expect(thinAnalysis(analysis, 10_000)).toBe(analysis);
  });

  it('refuses a maxPoints outside 100 to 1,000,000', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const list = await lead.get('/api/sessions');
    const response = await lead.get(`/api/sessions/${list.body.items[0].id}/analysis?maxPoints=5`);
    expect(response.status).toBe(400);
    expect(response.body.fields.maxPoints).toBeDefined();
  });
});
