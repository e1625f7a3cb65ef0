import { describe, expect, it } from 'vitest';
import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import { applyLivePoints } from '../../../../src/features/bench-sessions/hooks/use-live-session';

const sweep: SweepSummary = {
  id: 's1',
  sessionId: 'x',
  mode: 'common-mode',
  source: 'stream',
  sourceName: 'sim',
  state: 'streaming',
  pointCount: 2,
  frequencyRangeHz: [10, 20],
  createdBy: { id: 'u', name: 'U' },
  createdAt: '',
  deletedAt: null,
  deletedBy: null,
  deleteReason: null,
};
const point = (seq: number, frequencyHz: number) => ({ seq, frequencyHz, vinV: 1, voutV: 0.001, phaseDeg: null, floorV: null });
const message = (points: ReturnType<typeof point>[], sweepId = 's1') => ({ type: 'session-points' as const, sessionId: 'x', sweepId, mode: 'common-mode' as const, points });

describe('applyLivePoints', () => {
  it('counts points by their highest sequence number and widens the frequency range', () => {
    const [updated] = applyLivePoints([sweep], message([point(3, 40), point(4, 5)]))!;
    expect(updated.pointCount).toBe(4);
    expect(updated.frequencyRangeHz).toEqual([5, 40]);
  });

  it('does not count a resent batch twice', () => {
    const once = applyLivePoints([sweep], message([point(3, 40)]))!;
    expect(applyLivePoints(once, message([point(3, 40)]))![0].pointCount).toBe(3);
  });

  it('returns null for a sweep the list does not know yet (the caller refetches)', () => {
    expect(applyLivePoints([sweep], message([point(1, 10)], 'other'))).toBeNull();
  });
});
