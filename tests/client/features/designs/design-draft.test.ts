import { describe, expect, it } from 'vitest';
import type { DesignRevision } from '../../../../shared/schemas/designs';
import { draftFromRevision, emptyDesignDraft, maskRow, revisionInputFromDraft, withoutRevisionPrefix, type DesignDraft } from '../../../../src/features/designs/components/design-draft';

function filledDraft(): DesignDraft {
  const draft = emptyDesignDraft();
  for (const name of ['r1', 'r3'] as const) draft.resistors[name] = { ohms: '1k', tolerancePercent: '0.1' };
  for (const name of ['r2', 'r4'] as const) draft.resistors[name] = { ohms: '10k', tolerancePercent: '0.1' };
  draft.maskRows = [maskRow('10', '70'), maskRow('100k', '40')];
  return draft;
}

describe('revisionInputFromDraft', () => {
  it('turns typed values into the API input, tolerances from percent to fractions', () => {
    const { input, errors } = revisionInputFromDraft(filledDraft());
    expect(errors).toEqual({});
    expect(input?.circuit).toMatchObject({ topology: 'difference-amplifier', r1: { ohms: 1000, tolerance: 0.001 }, r2: { ohms: 10_000, tolerance: 0.001 }, opAmp: null });
    expect(input?.limitMask).toEqual({ points: [{ frequencyHz: 10, minimumCmrrDb: 70 }, { frequencyHz: 100_000, minimumCmrrDb: 40 }], guardBandDb: 0 });
  });

  it('names each empty or unreadable resistor by the API path', () => {
    const draft = filledDraft();
    draft.resistors.r2 = { ohms: '', tolerancePercent: 'abc' };
    const { input, errors } = revisionInputFromDraft(draft);
    expect(input).toBeNull();
    expect(errors['circuit.r2.ohms']).toBe('R2 is required');
    expect(errors['circuit.r2.tolerance']).toBe('R2 tolerance: “abc” is not a number');
  });

  it('refuses a tolerance of 50 % or more, in percent words', () => {
    const draft = filledDraft();
    draft.resistors.r4.tolerancePercent = '50';
    expect(revisionInputFromDraft(draft).errors['circuit.r4.tolerance']).toBe('R4 tolerance must be above 0 % and below 50 %');
  });

  it('asks for all op-amp fields once one is filled in', () => {
    const draft = filledDraft();
    draft.opAmp.partNumber = 'HX-2207';
    const { errors } = revisionInputFromDraft(draft);
    expect(errors['circuit.opAmp.gainBandwidthHz']).toBe('Fill in all op-amp fields, or leave them all blank');
    expect(errors['circuit.opAmp.partNumber']).toBeUndefined();
  });

  it('passes the shared schema’s message for mask frequencies that do not rise', () => {
    const draft = filledDraft();
    draft.maskRows = [maskRow('1k', '70'), maskRow('100', '40')];
    expect(revisionInputFromDraft(draft).errors['limitMask.points']).toBe('Mask frequencies must rise strictly from one point to the next');
  });

  it('needs the in-amp’s own resistors only for that topology', () => {
    const draft = filledDraft();
    draft.topology = 'instrumentation-amplifier';
    expect(revisionInputFromDraft(draft).errors['circuit.gainResistor.ohms']).toBe('RG is required');
    draft.resistors.feedback1 = { ohms: '24.9k', tolerancePercent: '0.1' };
    draft.resistors.feedback2 = { ohms: '24.9k', tolerancePercent: '0.1' };
    draft.resistors.gainResistor = { ohms: '499', tolerancePercent: '0.1' };
    expect(revisionInputFromDraft(draft).input?.circuit).toMatchObject({ topology: 'instrumentation-amplifier', gainResistor: { ohms: 499 } });
  });
});

describe('draftFromRevision', () => {
  it('prefills the form from a stored revision and round-trips to the same input', () => {
    const { input } = revisionInputFromDraft({ ...filledDraft(), label: 'A' });
    const revision = { ...input!, id: 'r', designId: 'd', revision: 1, changeNote: '', createdBy: { id: 'u', name: 'U' }, createdAt: '', sessionCount: 0 } as unknown as DesignRevision;
    const draft = draftFromRevision(revision);
    expect(draft.label).toBe('');
    expect(draft.resistors.r1).toEqual({ ohms: '1000', tolerancePercent: '0.1' });
    expect(revisionInputFromDraft({ ...draft, label: 'B' }).input?.circuit).toEqual(input!.circuit);
  });
});

describe('withoutRevisionPrefix', () => {
  it('maps create-design field keys onto the form’s keys', () => {
    expect(withoutRevisionPrefix({ 'revision.circuit.r1.ohms': 'x', name: 'y' })).toEqual({ 'circuit.r1.ohms': 'x', name: 'y' });
  });
});
