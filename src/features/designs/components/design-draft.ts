// The design form's own state (text as typed) and its translation to and from the API's revision
// input. Kept apart from the form so the conversions can be tested without a browser.
import {
  circuitResistorKeys,
  circuitResistorLabels,
  designRevisionInputSchema,
  topologyResistorKeys,
  type CircuitResistorKey,
  type Circuit,
  type DesignRevision,
  type DesignRevisionInput,
  type Topology,
} from '../../../../shared/schemas/designs';
import { numberToField, parseEngineeringNumber } from '../../../lib/parse-number';

export const opAmpFields = ['partNumber', 'openLoopGainDb', 'gainBandwidthHz', 'cmrrDb', 'cmrrCornerHz'] as const;
export type OpAmpField = (typeof opAmpFields)[number];

export type ResistorDraft = { ohms: string; tolerancePercent: string };
export type MaskRowDraft = { key: number; frequencyHz: string; minimumCmrrDb: string };

export type DesignDraft = {
  label: string;
  topology: Topology;
  resistors: Record<CircuitResistorKey, ResistorDraft>;
  toleranceDistribution: 'uniform' | 'normal';
  sourceResistance1Ohms: string;
  sourceResistance2Ohms: string;
  opAmp: Record<OpAmpField, string>;
  maskRows: MaskRowDraft[];
  guardBandDb: string;
  changeNote: string;
};

let nextMaskKey = 1;
/** A fresh mask row with a key of its own (React list identity). */
export function maskRow(frequencyHz = '', minimumCmrrDb = ''): MaskRowDraft {
  return { key: nextMaskKey++, frequencyHz, minimumCmrrDb };
}

/** An empty form: a difference amplifier, 0.1 % resistors, a one-point mask to fill in. */
export function emptyDesignDraft(): DesignDraft {
  const resistor = (): ResistorDraft => ({ ohms: '', tolerancePercent: '0.1' });
  return {
    label: 'A',
    topology: 'difference-amplifier',
    resistors: Object.fromEntries(circuitResistorKeys.map((name) => [name, resistor()])) as Record<CircuitResistorKey, ResistorDraft>,
    toleranceDistribution: 'uniform',
    sourceResistance1Ohms: '0',
    sourceResistance2Ohms: '0',
    opAmp: { partNumber: '', openLoopGainDb: '', gainBandwidthHz: '', cmrrDb: '', cmrrCornerHz: '' },
    maskRows: [maskRow()],
    guardBandDb: '0',
    changeNote: '',
  };
}

/** The form prefilled from a stored revision (the "edit" of a design, saved as a new revision). */
export function draftFromRevision(revision: DesignRevision): DesignDraft {
  const draft = emptyDesignDraft();
  const circuit = revision.circuit;
  const resistors = { ...draft.resistors };
  for (const name of topologyResistorKeys[circuit.topology]) {
    const stored = (circuit as Record<string, unknown>)[name] as { ohms: number; tolerance: number };
    resistors[name] = { ohms: numberToField(stored.ohms), tolerancePercent: numberToField(stored.tolerance * 100) };
  }
  return {
    label: '',
    topology: circuit.topology,
    resistors,
    toleranceDistribution: circuit.toleranceDistribution,
    sourceResistance1Ohms: numberToField(circuit.sourceResistance1Ohms),
    sourceResistance2Ohms: numberToField(circuit.sourceResistance2Ohms),
    opAmp: circuit.opAmp
      ? {
          partNumber: circuit.opAmp.partNumber,
          openLoopGainDb: numberToField(circuit.opAmp.openLoopGainDb),
          gainBandwidthHz: numberToField(circuit.opAmp.gainBandwidthHz),
          cmrrDb: numberToField(circuit.opAmp.cmrrDb),
          cmrrCornerHz: numberToField(circuit.opAmp.cmrrCornerHz),
        }
      : draft.opAmp,
    maskRows: revision.limitMask.points.map((point) => maskRow(numberToField(point.frequencyHz), numberToField(point.minimumCmrrDb))),
    guardBandDb: numberToField(revision.limitMask.guardBandDb),
    changeNote: '',
  };
}

export type DraftResult = { input: DesignRevisionInput | null; errors: Record<string, string> };

/**
 * Turns the form's text into a revision input. Field errors are keyed by the dotted path the API
 * uses (`circuit.r1.ohms`, `limitMask.points.0.frequencyHz`), so client and server messages land
 * beside the same fields. Tolerances are typed in percent and sent as fractions.
 */
export function revisionInputFromDraft(draft: DesignDraft): DraftResult {
  const errors: Record<string, string> = {};
  const number = (text: string, key: string, what: string): number => {
    const value = parseEngineeringNumber(text);
    if (value === null) {
      errors[key] ??= text.trim() === '' ? `${what} is required` : `${what}: “${text.trim()}” is not a number`;
      return Number.NaN;
    }
    return value;
  };

  const resistors: Record<string, { ohms: number; tolerance: number }> = {};
  for (const name of topologyResistorKeys[draft.topology]) {
    const label = circuitResistorLabels[name];
    const ohms = number(draft.resistors[name].ohms, `circuit.${name}.ohms`, label);
    const percent = number(draft.resistors[name].tolerancePercent, `circuit.${name}.tolerance`, `${label} tolerance`);
    if (Number.isFinite(percent) && !(percent > 0 && percent < 50)) errors[`circuit.${name}.tolerance`] = `${label} tolerance must be above 0 % and below 50 %`;
    resistors[name] = { ohms, tolerance: percent / 100 };
  }

  const filledOpAmp = opAmpFields.filter((field) => draft.opAmp[field].trim() !== '');
  let opAmp: Circuit['opAmp'] = null;
  if (filledOpAmp.length > 0) {
    for (const field of opAmpFields) {
      if (draft.opAmp[field].trim() === '') errors[`circuit.opAmp.${field}`] = 'Fill in all op-amp fields, or leave them all blank';
    }
    opAmp = {
      partNumber: draft.opAmp.partNumber.trim(),
      openLoopGainDb: number(draft.opAmp.openLoopGainDb, 'circuit.opAmp.openLoopGainDb', 'Open-loop gain'),
      gainBandwidthHz: number(draft.opAmp.gainBandwidthHz, 'circuit.opAmp.gainBandwidthHz', 'Gain-bandwidth product'),
      cmrrDb: number(draft.opAmp.cmrrDb, 'circuit.opAmp.cmrrDb', 'Op-amp CMRR'),
      cmrrCornerHz: number(draft.opAmp.cmrrCornerHz, 'circuit.opAmp.cmrrCornerHz', 'Op-amp CMRR corner'),
    };
  }

  const common = {
    sourceResistance1Ohms: number(draft.sourceResistance1Ohms || '0', 'circuit.sourceResistance1Ohms', 'Rs1'),
    sourceResistance2Ohms: number(draft.sourceResistance2Ohms || '0', 'circuit.sourceResistance2Ohms', 'Rs2'),
    toleranceDistribution: draft.toleranceDistribution,
    opAmp,
  };
  const circuit =
    draft.topology === 'difference-amplifier'
      ? { topology: draft.topology, r1: resistors.r1, r2: resistors.r2, r3: resistors.r3, r4: resistors.r4, ...common }
      : {
          topology: draft.topology,
          feedback1: resistors.feedback1,
          feedback2: resistors.feedback2,
          gainResistor: resistors.gainResistor,
          r1: resistors.r1,
          r2: resistors.r2,
          r3: resistors.r3,
          r4: resistors.r4,
          ...common,
        };

  const points = draft.maskRows.map((row, index) => ({
    frequencyHz: number(row.frequencyHz, `limitMask.points.${index}.frequencyHz`, 'Mask frequency'),
    minimumCmrrDb: number(row.minimumCmrrDb, `limitMask.points.${index}.minimumCmrrDb`, 'Minimum CMRR'),
  }));
  const input: DesignRevisionInput = {
    label: draft.label,
    circuit: circuit as DesignRevisionInput['circuit'],
    limitMask: { points, guardBandDb: number(draft.guardBandDb || '0', 'limitMask.guardBandDb', 'Guard band') },
    changeNote: draft.changeNote,
  };

  const parsed = designRevisionInputSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = issue.path.map(String).join('.');
      errors[key] ??= issue.message;
    }
  }
  return Object.keys(errors).length > 0 ? { input: null, errors } : { input, errors };
}

/** Server field keys of a create-design request carry a `revision.` prefix; the form's do not. */
export function withoutRevisionPrefix(fields: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(fields).map(([key, message]) => [key.replace(/^revision\./, ''), message]));
}
