import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir } from '../helpers/browser';
import { startTestApp, type TestApp } from '../helpers/test-app';

// The demo lab's data (server/demo/scenario.ts) is the subject; the PDF is read back with
// poppler's pdftotext, an independent reader (npm test installs poppler-utils when missing).
let app: TestApp;
let lead: ReturnType<typeof request.agent>;
const work = mkdtempSync(path.join(os.tmpdir(), 'rejectra-export-'));

beforeAll(async () => {
  app = await startTestApp({ seed: 'demo' });
  lead = await app.signedIn('lead@rejectra.test');
});
afterAll(async () => {
  await app?.close();
});

async function sessionOf(unitSerial: string): Promise<string> {
  const list = await lead.get(`/api/sessions?search=${unitSerial}`);
  return list.body.items[0].id;
}

function pdfText(bytes: Buffer, name: string): string {
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, bytes);
  writeFileSync(path.join(artifactsDir('exports'), `${name}.pdf`), bytes);
  return execFileSync('pdftotext', ['-layout', file, '-']).toString('utf8');
}

describe('GET /api/sessions/:id/report.pdf', () => {
  it('holds the unit, design, verdict, fit, instruments with calibration dates and the points', async () => {
    const id = await sessionOf('HRB204-0012');
    const response = await lead.get(`/api/sessions/${id}/report.pdf`).buffer(true).parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toBe('application/pdf');
    const text = pdfText(response.body as Buffer, 'hrb204-0012');
    expect(text).toContain('HRB204-0012 — LC-Bridge front-end board HRB-204, rev D');
    // The verdict line of shared/analysis/session-summary.ts, capitalised.
    expect(text).toMatch(/^\s*(Passes with|Fails by|Indeterminate:) /m);
    expect(text).toContain('Fit against frequency');
    expect(text).toMatch(/Selective\s+analyser SA-9/);
    expect(text).toMatch(/calibration\s+due\s+2026-12-15/);
    // Lower bounds are marked in the points table (the PDF's fonts spell ≥ as >=).
    expect(text).toMatch(/>= \d+\.\d\d dB/);
    expect(text).not.toContain('hazardous live');
  });

  it('carries the safety note when the common-mode drive was hazardous', async () => {
    const id = await sessionOf('HRB311-0001');
    const response = await lead.get(`/api/sessions/${id}/report.pdf`).buffer(true).parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });
    const text = pdfText(response.body as Buffer, 'hrb311-0001');
    expect(text).toContain('Safety: hazardous common-mode drive');
    expect(text).toMatch(/hazardous\s+live/);
  });
});

describe('GET /api/sessions/:id/export.csv and export.json', () => {
  it('exports the analysed points as CSV with the context in comment lines', async () => {
    const id = await sessionOf('HRB204-0007');
    const response = await lead.get(`/api/sessions/${id}/export.csv`);
    expect(response.status).toBe(200);
    expect(response.headers['content-disposition']).toMatch(/HRB204-0007-rev-C\.csv/);
    const lines = response.text.trim().split('\n');
    expect(lines[0]).toBe(`# Rejectra bench session ${id}`);
    const header = lines.find((line) => !line.startsWith('#'))!;
    expect(header).toBe('frequency_hz,ad,acm,cmrr_db,lower_bound,ad_interpolated,predicted_cmrr_db,fitted_cmrr_db,limit_db,margin_db,outcome');
    const analysis = (await lead.get(`/api/sessions/${id}/analysis`)).body.analysis;
    const dataLines = lines.filter((line) => !line.startsWith('#')).slice(1);
    expect(dataLines).toHaveLength(analysis.points.length);
    expect(Number(dataLines[0].split(',')[3])).toBe(analysis.points[0].cmrrDb);
  });

  it('exports the whole record as JSON: session, design, every sweep with its points, the analysis', async () => {
    const id = await sessionOf('HRB204-0007');
    const response = await lead.get(`/api/sessions/${id}/export.json`);
    expect(response.body.format).toBe('rejectra-session/1');
    expect(response.body.sweeps).toHaveLength(2);
    expect(response.body.sweeps[0].points).toHaveLength(response.body.sweeps[0].pointCount);
    expect(response.body.analysis.status).toBe('complete');
  });

  it('answers 404 for an unknown session and 401 when signed out', async () => {
    expect((await lead.get('/api/sessions/00000000-0000-4000-8000-000000000000/report.pdf')).status).toBe(404);
    expect((await request(app.url).get('/api/sessions/x/export.csv')).status).toBe(401);
  });
});

describe('GET /api/designs/:id/revisions/:revisionId/lot', () => {
  it('lists every unit of the demo lot with its analysis, and exports the lot as CSV', async () => {
    const designs = (await lead.get('/api/designs')).body.designs as { id: string; name: string }[];
    const bridge = designs.find((design) => design.name === 'LC-Bridge front-end board HRB-204')!;
    const detail = (await lead.get(`/api/designs/${bridge.id}`)).body.design;
    const revC = detail.revisions.find((revision: { label: string }) => revision.label === 'rev C');
    const lot = (await lead.get(`/api/designs/${bridge.id}/revisions/${revC.id}/lot`)).body.lot;
    // server/demo/scenario.ts: units 1–8 are rev C.
    expect(lot.units.map((unit: { unitSerial: string }) => unit.unitSerial)).toEqual(Array.from({ length: 8 }, (_, index) => `HRB204-000${index + 1}`));
    expect(lot.units.every((unit: { analysis: { status: string } }) => unit.analysis.status === 'complete')).toBe(true);
    const csv = await lead.get(`/api/designs/${bridge.id}/revisions/${revC.id}/lot/export.csv`);
    const data = csv.text.trim().split('\n').filter((line) => !line.startsWith('#'));
    expect(data[0]).toBe('unit_serial,session_id,measured_at,frequency_hz,cmrr_db,lower_bound,limit_db,margin_db,outcome');
    expect(data.length - 1).toBe(lot.units.reduce((sum: number, unit: { analysis: { points: unknown[] } }) => sum + unit.analysis.points.length, 0));
    expect((await lead.get(`/api/designs/${bridge.id}/revisions/00000000-0000-4000-8000-000000000000/lot`)).status).toBe(404);
  });
});
