// The tolerance explorer's own state (text as typed) and its translation into the circuit the
// shared engine computes with. Kept apart from the components so the mapping is testable without
// a browser. Nothing here is ever saved: the explorer tries values, the stored revision stays.
import {
  circuitResistorKeys,
  circuitResistorLabels,
  topologyResistorKeys,
  type Circuit,
  type CircuitResistorKey,
  type LimitMaskData,
} from '../../../../shared/schemas/designs';
import { numberToField, parseEngineeringNumber } from '../../../lib/parse-number';

export type OpAmpFieldKey = 'openLoopGainDb' | 'gainBandwidthHz' | 'cmrrDb' | 'cmrrCornerHz';
export const opAmpFieldKeys: readonly OpAmpFieldKey[] = ['openLoopGainDb', 'gainBandwidthHz', 'cmrrDb', 'cmrrCornerHz'];

export interface ExplorerState {
  /** One tolerance for every resistor, or one per resistor. */
  toleranceMode: 'all' | 'each';
  /** Percent, as typed (0.1 means 0.1 %). */
  allTolerancePercent: string;
  eachTolerancePercent: Record<CircuitResistorKey, string>;
  distribution: 'uniform' | 'normal';
  sourceResistance1Ohms: string;
  sourceResistance2Ohms: string;
  /** False: ideal op-amps. */
  opAmpEnabled: boolean;
  opAmp: Record<OpAmpFieldKey, string>;
  /** The histogram's frequency, Hz, as typed. */
  frequencyHz: string;
}

/** Where a typed value is wrong; keys are ExplorerState paths (`allTolerancePercent`, `each.r2`, `opAmp.cmrrDb`, `frequencyHz`). */
export type ExplorerErrors = Partial<Record<string, string>>;

function resistorOf(circuit: Circuit, key: CircuitResistorKey): { ohms: number; tolerance: number } | null {
  const value = (circuit as Record<string, unknown>)[key];
  return value && typeof value === 'object' && 'ohms' in value ? (value as { ohms: number; tolerance: number }) : null;
}

const percentText = (fraction: number) => numberToField(fraction * 100);

/**
 * The explorer's starting point: the stored revision's values, one shared tolerance when every
 * resistor has the same one. The frequency starts where the nominal design is closest to the
 * mask (`startFrequencyHz`, from {@link tightestMaskFrequencyHz}).
 */
export function explorerStateFromCircuit(circuit: Circuit, startFrequencyHz: number): ExplorerState {
  const keys = topologyResistorKeys[circuit.topology];
  const tolerances = keys.map((key) => resistorOf(circuit, key)?.tolerance ?? 0.001);
  const allSame = tolerances.every((tolerance) => tolerance === tolerances[0]);
  const each = Object.fromEntries(circuitResistorKeys.map((key) => [key, percentText(resistorOf(circuit, key)?.tolerance ?? tolerances[0])])) as Record<CircuitResistorKey, string>;
  const opAmp = circuit.opAmp;
  return {
    toleranceMode: allSame ? 'all' : 'each',
    allTolerancePercent: percentText(Math.max(...tolerances)),
    eachTolerancePercent: each,
    distribution: circuit.toleranceDistribution,
    sourceResistance1Ohms: numberToField(circuit.sourceResistance1Ohms),
    sourceResistance2Ohms: numberToField(circuit.sourceResistance2Ohms),
    opAmpEnabled: opAmp !== null,
    opAmp: {
      // Typical precision-part figures stand in when the design has none, so switching the op-amp on shows something sensible.
      openLoopGainDb: numberToField(opAmp?.openLoopGainDb ?? 120),
      gainBandwidthHz: numberToField(opAmp?.gainBandwidthHz ?? 1e6),
      cmrrDb: numberToField(opAmp?.cmrrDb ?? 110),
      cmrrCornerHz: numberToField(opAmp?.cmrrCornerHz ?? 1000),
    },
    frequencyHz: numberToField(startFrequencyHz),
  };
}

function readNumber(text: string, key: string, what: string, errors: ExplorerErrors, check: (value: number) => string | null): number {
  const value = parseEngineeringNumber(text);
  if (value === null) {
    errors[key] = text.trim() === '' ? `${what} is needed` : `${what}: “${text.trim()}” is not a number`;
    return Number.NaN;
  }
  const problem = check(value);
  if (problem) errors[key] = problem;
  return value;
}

const tolerancePercentCheck = (what: string) => (percent: number) => (percent > 0 && percent < 50 ? null : `${what} must be above 0 % and below 50 %`);

/** Result of {@link explorerCircuit}. */
export interface ExplorerCircuitResult {
  /** The circuit to compute with, or null while a value is unusable. */
  circuit: Circuit | null;
  errors: ExplorerErrors;
  /** Analysis frequency, Hz (NaN when unusable). */
  frequencyHz: number;
}

/**
 * The circuit the explorer's values describe: the stored revision with its tolerances,
 * distribution, source resistances and op-amp data replaced by what is typed (resistor values
 * themselves stay). Tolerances are typed in percent and become fractions. With errors the
 * circuit is null and the errors say which field and why.
 *
 * @example explorerCircuit(revC, { ...state, allTolerancePercent: '0.01' }).circuit.r4.tolerance // → 0.0001
 */
export function explorerCircuit(base: Circuit, state: ExplorerState): ExplorerCircuitResult {
  const errors: ExplorerErrors = {};
  const keys = topologyResistorKeys[base.topology];
  const shared = state.toleranceMode === 'all' ? readNumber(state.allTolerancePercent, 'allTolerancePercent', 'Tolerance', errors, tolerancePercentCheck('Tolerance')) : Number.NaN;
  const resistors: Record<string, { ohms: number; tolerance: number }> = {};
  for (const key of keys) {
    const stored = resistorOf(base, key)!;
    const percent =
      state.toleranceMode === 'all'
        ? shared
        : readNumber(state.eachTolerancePercent[key], `each.${key}`, `${circuitResistorLabels[key]} tolerance`, errors, tolerancePercentCheck(`${circuitResistorLabels[key]} tolerance`));
    resistors[key] = { ohms: stored.ohms, tolerance: percent / 100 };
  }
  const notNegative = (what: string) => (value: number) => (value >= 0 ? null : `${what} cannot be negative`);
  const sourceResistance1Ohms = readNumber(state.sourceResistance1Ohms || '0', 'sourceResistance1Ohms', 'Rs1', errors, notNegative('Rs1'));
  const sourceResistance2Ohms = readNumber(state.sourceResistance2Ohms || '0', 'sourceResistance2Ohms', 'Rs2', errors, notNegative('Rs2'));
  let opAmp: Circuit['opAmp'] = null;
  if (state.opAmpEnabled) {
    const decibels = (what: string) => (value: number) => (value > 0 && value < 250 ? null : `${what} must be between 0 and 250 dB`);
    const positive = (what: string) => (value: number) => (value > 0 ? null : `${what} must be above 0 Hz`);
    opAmp = {
      partNumber: base.opAmp?.partNumber ?? 'explored op-amp',
      openLoopGainDb: readNumber(state.opAmp.openLoopGainDb, 'opAmp.openLoopGainDb', 'A0', errors, decibels('A0')),
      gainBandwidthHz: readNumber(state.opAmp.gainBandwidthHz, 'opAmp.gainBandwidthHz', 'GBW', errors, positive('GBW')),
      cmrrDb: readNumber(state.opAmp.cmrrDb, 'opAmp.cmrrDb', 'Op-amp CMRR', errors, decibels('Op-amp CMRR')),
      cmrrCornerHz: readNumber(state.opAmp.cmrrCornerHz, 'opAmp.cmrrCornerHz', 'CMRR corner', errors, positive('CMRR corner')),
    };
  }
  const frequencyHz = readNumber(state.frequencyHz, 'frequencyHz', 'Frequency', errors, (value) => (value > 0 && value <= 1e9 ? null : 'Frequency must be above 0 Hz and at most 1 GHz'));
  if (Object.keys(errors).length > 0) return { circuit: null, errors, frequencyHz: errors.frequencyHz ? Number.NaN : frequencyHz };
  const circuit = { ...base, ...resistors, toleranceDistribution: state.distribution, sourceResistance1Ohms, sourceResistance2Ohms, opAmp } as Circuit;
  return { circuit, errors, frequencyHz };
}

/** Which explored values differ from the stored revision, in words ("tolerance 0.1 % → 0.01 %"), for the "not saved" note. */
export function explorerChanges(stored: Circuit, explored: Circuit): string[] {
  const changes: string[] = [];
  const percent = (fraction: number) => `${numberToField(fraction * 100)} %`;
  for (const key of topologyResistorKeys[stored.topology]) {
    const before = resistorOf(stored, key)!.tolerance;
    const after = resistorOf(explored, key)!.tolerance;
    if (before !== after) changes.push(`${circuitResistorLabels[key]} ±${percent(before)} → ±${percent(after)}`);
  }
  if (stored.toleranceDistribution !== explored.toleranceDistribution) changes.push(`distribution ${stored.toleranceDistribution} → ${explored.toleranceDistribution}`);
  if (stored.sourceResistance1Ohms !== explored.sourceResistance1Ohms) changes.push(`Rs1 ${stored.sourceResistance1Ohms} Ω → ${explored.sourceResistance1Ohms} Ω`);
  if (stored.sourceResistance2Ohms !== explored.sourceResistance2Ohms) changes.push(`Rs2 ${stored.sourceResistance2Ohms} Ω → ${explored.sourceResistance2Ohms} Ω`);
  const a = stored.opAmp;
  const b = explored.opAmp;
  if ((a === null) !== (b === null)) changes.push(b ? 'op-amp data added' : 'ideal op-amp');
  else if (a && b) {
    if (a.openLoopGainDb !== b.openLoopGainDb) changes.push(`A0 ${a.openLoopGainDb} → ${b.openLoopGainDb} dB`);
    if (a.gainBandwidthHz !== b.gainBandwidthHz) changes.push(`GBW ${a.gainBandwidthHz} → ${b.gainBandwidthHz} Hz`);
    if (a.cmrrDb !== b.cmrrDb) changes.push(`op-amp CMRR ${a.cmrrDb} → ${b.cmrrDb} dB`);
    if (a.cmrrCornerHz !== b.cmrrCornerHz) changes.push(`CMRR corner ${a.cmrrCornerHz} → ${b.cmrrCornerHz} Hz`);
  }
  return changes;
}

/**
 * Frequencies for the predicted curves and the Monte Carlo band: `perDecade` points per decade,
 * evenly in log f, over whole decades from one below the mask's lowest corner (at least 1 Hz
 * lower than it) to one above its highest, plus every mask corner and `extraHz` exactly (so the
 * band is exact where the limit has its corners and at the histogram's frequency). Ascending,
 * without duplicates (to 1e-9 relative). O(points).
 *
 * @example explorerFrequencies({ points: [{ frequencyHz: 10, minimumCmrrDb: 80 }] }, [], 2) // → [1, 3.16…, 10, 31.6…, 100]
 */
export function explorerFrequencies(mask: Pick<LimitMaskData, 'points'>, extraHz: readonly number[], perDecade = 6): number[] {
  const corners = mask.points.map((point) => point.frequencyHz);
  const low = Math.min(...corners, ...extraHz.filter((value) => value > 0));
  const high = Math.max(...corners, ...extraHz.filter((value) => value > 0));
  const firstDecade = Math.floor(Math.log10(low)) - (Number.isInteger(Math.log10(low)) ? 1 : 0);
  const lastDecade = Math.ceil(Math.log10(high)) + 1;
  const values: number[] = [];
  for (let step = firstDecade * perDecade; step <= lastDecade * perDecade; step++) values.push(10 ** (step / perDecade));
  values.push(...corners, ...extraHz.filter((value) => value > 0));
  values.sort((a, b) => a - b);
  return values.filter((value, index) => index === 0 || value - values[index - 1] > values[index - 1] * 1e-9);
}

/** Margins closer than this count as a tie, settled towards the higher frequency (where op-amp terms add to the mismatch). */
const TIE_DB = 0.5;

/**
 * The mask corner where `expectedDb` (the explorer uses the corner worst case) has the least
 * margin over the limit: a sensible first frequency for the histogram. Null values are skipped;
 * falls back to the first corner.
 *
 * @example tightestMaskFrequencyHz({ points: [{ frequencyHz: 10, minimumCmrrDb: 80 }, { frequencyHz: 1000, minimumCmrrDb: 70 }] }, () => 75) // → 10
 */
export function tightestMaskFrequencyHz(mask: Pick<LimitMaskData, 'points'>, expectedDb: (frequencyHz: number) => number | null): number {
  let best = mask.points[0].frequencyHz;
  let bestMargin = Infinity;
  for (const point of mask.points) {
    const expected = expectedDb(point.frequencyHz);
    if (expected === null || Number.isNaN(expected)) continue;
    const margin = expected - point.minimumCmrrDb;
    // Corners come in rising frequency: a tie moves the choice up.
    if (margin <= bestMargin + TIE_DB) {
      best = point.frequencyHz;
      bestMargin = Math.min(bestMargin, margin);
    }
  }
  return best;
}

/** Nominal gains of the design for the "what tolerance" and E-series answers (ideal op-amps). */
export interface DesignGains {
  /** R2/R1 of the difference stage. */
  stageGain: number;
  /** 1 + (RF1 + RF2)/RG for an instrumentation amplifier; 1 for a difference amplifier. */
  frontGain: number;
  /** 20·log10(frontGain): what the input stage adds to the difference stage's rejection, dB. */
  frontGainDb: number;
}

/** The gains that set how much resistor mismatch a design tolerates (DOMAIN.md: CMRR ≈ (1 + G)/(4ε) for the stage, times the front gain of an in-amp). */
export function designGains(circuit: Circuit): DesignGains {
  const stageGain = circuit.r2.ohms / circuit.r1.ohms;
  const frontGain = circuit.topology === 'instrumentation-amplifier' ? 1 + (circuit.feedback1.ohms + circuit.feedback2.ohms) / circuit.gainResistor.ohms : 1;
  return { stageGain, frontGain, frontGainDb: 20 * Math.log10(frontGain) };
}

/** A log-scale slider position (0 … 1000) for a tolerance in percent, 0.001 % … 1 %, and back (rounded to 2 significant figures). */
export const toleranceSlider = {
  minimumPercent: 0.001,
  maximumPercent: 1,
  toPosition(percent: number): number {
    const clamped = Math.min(Math.max(percent, this.minimumPercent), this.maximumPercent);
    return Math.round((1000 * Math.log10(clamped / this.minimumPercent)) / Math.log10(this.maximumPercent / this.minimumPercent));
  },
  toPercent(position: number): number {
    const raw = this.minimumPercent * (this.maximumPercent / this.minimumPercent) ** (position / 1000);
    return Number(raw.toPrecision(2));
  },
};
