import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { lotBandFrequencies, lotBandPointsPerDecade } from '../../server/analysis/lot';
import { Design, DesignRevision, User } from '../../server/models';
import { addCompleteSweeps, createBenchSession } from '../../server/operations/bench-sessions';
import { createBenchSessionSchema } from '../../shared/schemas/bench-sessions';
import { simulatedSweepRows } from '../helpers/bench-fixtures';
import { startTestApp, type TestApp } from '../helpers/test-app';

// A lot with one long-sweep unit: the page gets each unit thinned for drawing and a predicted band
// on a bounded grid (10,000 trials at each of 20,000 frequencies would take minutes), while the
// exports keep every point and the summary is made from every point.
describe('lotBandFrequencies', () => {
  it('keeps every measured frequency of a short lot', () => {
    expect(lotBandFrequencies([100, 10, 1000, 10, 100], [10, 1000])).toEqual([10, 100, 1000]);
  });

  it('uses a log grid with the mask corners in it for a long one', () => {
    const measured = Array.from({ length: 20_000 }, (_, index) => 10 * 10_000 ** (index / 19_999));
    const grid = lotBandFrequencies(measured, [10, 1000, 20_000, 1e6]);
    // 4 decades at 24 per decade: 97 grid points (10 Hz and 1 kHz among them), plus the 20 kHz
    // corner, which is not on the grid; 1 MHz lies outside the measured range.
    expect(grid.length).toBe(4 * lotBandPointsPerDecade + 1 + 1);
    expect(grid[0]).toBe(10);
    expect(grid.at(-1)).toBe(measured.at(-1));
    expect(grid).toContain(1000);
    expect(grid).toContain(20_000);
    expect(grid).not.toContain(1e6);
    expect([...grid].sort((a, b) => a - b)).toEqual(grid);
  });
});

describe('GET …/lot with a long-sweep unit', () => {
  let app: TestApp;
  let designId: string;
  let revisionId: string;
  const unitSerial = 'HRB204-9500';
  const pointCount = 20_000;

  beforeAll(async () => {
    app = await startTestApp({ seed: 'demo' });
    const sequelize = app.server.context.database.sequelize;
    const design = (await Design.findOne({ where: { name: 'LC-Bridge front-end board HRB-204' } }))!;
    const revision = (await DesignRevision.findOne({ where: { designId: design.id, label: 'rev D' } }))!;
    designId = design.id;
    revisionId = revision.id;
    const technician = (await User.findOne({ where: { email: 'tech@rejectra.test' } }))!;
    const session = await createBenchSession(
      sequelize,
      createBenchSessionSchema.parse({
        designRevisionId: revision.id,
        unitSerial,
        fixture: 'Bridge fixture BF-2',
        differentialDrive: { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 },
        commonModeDrive: { acVolts: 1, acConvention: 'rms', dcVolts: 0 },
      }),
      { id: technician.id, email: technician.email, name: technician.name, role: technician.role, status: technician.status },
      new Date(),
    );
    const sweep = (mode: 'differential' | 'common-mode') => simulatedSweepRows(mode, pointCount, mode === 'differential' ? 21 : 22);
    await addCompleteSweeps(sequelize, {
      sessionId: session.id,
      sweeps: [
        { mode: 'differential', source: 'upload', sourceName: 'long-d.csv', points: sweep('differential') },
        { mode: 'common-mode', source: 'upload', sourceName: 'long-c.csv', points: sweep('common-mode') },
      ],
      createdBy: { id: technician.id },
    });
  }, 120_000);
  afterAll(async () => {
    await app?.close();
  });

  it('sends the page each unit thinned and the band on a bounded grid, and exports every point', { timeout: 120_000 }, async () => {
    const lead = await app.signedIn('lead@rejectra.test');
    const lot = (await lead.get(`/api/designs/${designId}/revisions/${revisionId}/lot`).expect(200)).body.lot;
    const long = lot.units.find((unit: { unitSerial: string }) => unit.unitSerial === unitSerial);
    expect(long.analysis.thinnedFrom).toBe(pointCount);
    expect(long.analysis.points.length).toBeLessThanOrEqual(2000 + long.analysis.limits.verdicts.filter((verdict: { outcome: string }) => verdict.outcome === 'fail').length);
    // 10 Hz–100 kHz is 4 decades: at most 97 grid points and the mask's three corners.
    expect(lot.predictedBand.length).toBeLessThanOrEqual(4 * lotBandPointsPerDecade + 1 + 3);
    expect(lot.summary.units.some((unit: { unitSerial: string }) => unit.unitSerial === unitSerial)).toBe(true);

    const csv = await lead.get(`/api/designs/${designId}/revisions/${revisionId}/lot/export.csv`).expect(200);
    const rowsOfUnit = csv.text.split('\n').filter((line) => line.startsWith(`${unitSerial},`));
    expect(rowsOfUnit.length).toBe(pointCount);
  });
});
