import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analysisPointRows, pageAnalysisPoints } from '../../server/analysis/analysis-points';
import { analysisPointsQuerySchema, type SessionAnalysis } from '../../shared/schemas/analysis';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Four points by hand (invented for the test): 100 Hz passes with 4 dB, 1 kHz fails by 2 dB,
// 10 kHz sits inside the guard band, 100 kHz is outside the mask (no limit, no margin).
function handMadeAnalysis(): SessionAnalysis {
  const frequencies = [100, 1000, 10_000, 100_000];
  const cmrr = [84, 78, 80.5, 60];
  const limits: (number | null)[] = [80, 80, 80, null];
  const outcomes = ['pass', 'fail', 'indeterminate', 'outside-mask'] as const;
  return {
    sessionId: 's',
    status: 'complete',
    message: null,
    pointCounts: { differential: 4, commonMode: 4 },
    points: frequencies.map((frequencyHz, index) => ({ frequencyHz, ad: 10, acm: 10 / 10 ** (cmrr[index] / 20), cmrrDb: cmrr[index], lowerBound: index === 0, interpolated: false, commonModeLine: index + 1 })),
    fit: { fittedCmrrDb: [84.5, 78.5, 80, 61], residualsDb: [-0.5, -0.5, 0.5, -1] } as SessionAnalysis['fit'],
    warnings: [],
    prediction: frequencies.map((frequencyHz) => ({ frequencyHz, adDb: 20, acmDb: -70, cmrrDb: 90, cmrrBandLowDb: 89, cmrrBandHighDb: 91 })),
    limits: {
      guardBandDb: 1,
      overall: 'fail',
      verdicts: frequencies.map((frequencyHz, index) => ({
        frequencyHz,
        cmrrDb: cmrr[index],
        lowerBound: index === 0,
        limitDb: limits[index],
        marginDb: limits[index] === null ? null : cmrr[index] - limits[index]!,
        outcome: outcomes[index],
      })),
    },
    computedAt: '2026-11-20T08:00:00.000Z',
  };
}

const query = (changes: Record<string, string>) => analysisPointsQuerySchema.parse(changes);

describe('pageAnalysisPoints', () => {
  it('lists every point with its fit, residual, prediction, limit, margin and verdict, in frequency order', () => {
    const rows = analysisPointRows(handMadeAnalysis());
    expect(rows[1]).toEqual({ index: 1, frequencyHz: 1000, cmrrDb: 78, lowerBound: false, fittedCmrrDb: 78.5, residualDb: -0.5, predictedCmrrDb: 90, limitDb: 80, marginDb: -2, outcome: 'fail' });
    expect(rows[3]).toMatchObject({ limitDb: null, marginDb: null, outcome: 'outside-mask' });
  });

  it('puts the worst margin first, and points without a margin last in either direction', () => {
    expect(pageAnalysisPoints(handMadeAnalysis(), query({ sort: 'marginDb' })).items.map((row) => row.frequencyHz)).toEqual([1000, 10_000, 100, 100_000]);
    expect(pageAnalysisPoints(handMadeAnalysis(), query({ sort: 'marginDb', direction: 'desc' })).items.map((row) => row.frequencyHz)).toEqual([100, 10_000, 1000, 100_000]);
  });

  it('keeps rising frequency among equal values', () => {
    expect(pageAnalysisPoints(handMadeAnalysis(), query({ sort: 'residualDb' })).items.map((row) => row.frequencyHz)).toEqual([100_000, 100, 1000, 10_000]);
  });

  it('filters by verdict and pages what is left, counting both', () => {
    const failing = pageAnalysisPoints(handMadeAnalysis(), query({ outcome: 'fail' }));
    expect(failing.items.map((row) => row.frequencyHz)).toEqual([1000]);
    expect(failing.total).toBe(1);
    expect(failing.pointCount).toBe(4);
    const second = pageAnalysisPoints(handMadeAnalysis(), query({ pageSize: '3', page: '2', direction: 'desc' }));
    expect(second.items.map((row) => row.frequencyHz)).toEqual([100]);
    expect(second.total).toBe(4);
  });

  it('leaves fit and prediction empty where they do not line up with the points', () => {
    const analysis = { ...handMadeAnalysis(), fit: null, prediction: [] };
    expect(analysisPointRows(analysis)[0]).toMatchObject({ fittedCmrrDb: null, residualDb: null, predictedCmrrDb: null });
  });
});

describe('GET /api/sessions/:id/analysis/points', () => {
  let app: TestApp;
  let lead: ReturnType<typeof request.agent>;
  let sessionId: string;
  beforeAll(async () => {
    app = await startTestApp({ seed: 'demo' });
    lead = await app.signedIn('lead@rejectra.test');
    sessionId = (await lead.get('/api/sessions?search=HRB204-0012').expect(200)).body.items[0].id;
  });
  afterAll(async () => {
    await app?.close();
  });

  it('pages every analysed point, the same ones the full analysis holds', async () => {
    const analysis = (await lead.get(`/api/sessions/${sessionId}/analysis`).expect(200)).body.analysis as SessionAnalysis;
    const page = (await lead.get(`/api/sessions/${sessionId}/analysis/points?pageSize=10&sort=marginDb`).expect(200)).body;
    expect(page.pointCount).toBe(analysis.points.length);
    expect(page.total).toBe(analysis.points.length);
    expect(page.items).toHaveLength(10);
    expect(page.computedAt).toBe(analysis.computedAt);
    const margins = analysis.limits!.verdicts.map((verdict) => verdict.marginDb).filter((margin): margin is number => margin !== null);
    expect(page.items[0].marginDb).toBe(Math.min(...margins));
  });

  it('names the field of a bad query and answers 404 for an unknown session', async () => {
    const bad = await lead.get(`/api/sessions/${sessionId}/analysis/points?sort=phase&pageSize=0`).expect(400);
    expect(bad.body.error).toBe('Invalid analysed-points query');
    expect(Object.keys(bad.body.fields).sort()).toEqual(['pageSize', 'sort']);
    await lead.get('/api/sessions/no-such-session/analysis/points').expect(404);
  });

  it('is closed to people who are not signed in', async () => {
    await request(app.url).get(`/api/sessions/${sessionId}/analysis/points`).expect(401);
  });
});
