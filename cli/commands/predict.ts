// `rejectra predict --r1 Ω --r2 Ω --r3 Ω --r4 Ω [--rs1 Ω --rs2 Ω] [--open-loop-gain-db dB --gbw-hz Hz
// --opamp-cmrr-db dB --opamp-cmrr-corner-hz Hz] --frequencies F1,F2,… [--json]`: predicted Ad, Acm
// and CMRR of the four-resistor difference amplifier with the single-pole op-amp model of
// DOMAIN.md, for both signs of the op-amp's own common-mode term.
import { phaseDegComplex } from '../../shared/engine/complex';
import {
  predictDifferenceAmplifier,
  type DifferenceAmplifierPrediction,
  type DifferenceAmplifierResistors,
  type OpAmpModel,
} from '../../shared/engine/difference-amplifier';
import { EngineInputError } from '../../shared/engine/errors';
import { parseCommandArgs } from '../parse-command-args';
import { formatTable } from '../table';

const usage = `usage: rejectra predict --r1 OHMS --r2 OHMS --r3 OHMS --r4 OHMS [--rs1 OHMS --rs2 OHMS]
         [--open-loop-gain-db DB --gbw-hz HZ --opamp-cmrr-db DB --opamp-cmrr-corner-hz HZ]
         --frequencies F1,F2,... [--json]
  R1 from v1 to the inverting input, R2 feedback, R3 from v2 to the non-inverting input, R4 to the
  reference; Rs1/Rs2 are the source resistances in series with R1/R3 (default 0). Give all four
  op-amp values or none (an ideal op-amp). Frequencies in Hz (0 = dc). Numbers may end in k, M or G
  (4.99k). In JSON, infinite values (an exactly matched ideal circuit) are null.
`;

// A decimal number with an optional SI multiplier k, M or G ("4.99k", "1e3", "2M" yes; "0x10",
// "" or "m", which could mean milli or mega, no).
const decimalNumber = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)([kMG]?)$/;
const multipliers: Record<string, number> = { '': 1, k: 1e3, M: 1e6, G: 1e9 };

/** The number in `text`, or NaN when it is not one. */
function toNumber(text: string): number {
  const match = decimalNumber.exec(text.trim());
  return match ? Number(match[1]) * multipliers[match[2]] : Number.NaN;
}

const opAmpOptions = [
  ['open-loop-gain-db', 'openLoopGainDb'],
  ['gbw-hz', 'gainBandwidthHz'],
  ['opamp-cmrr-db', 'cmrrDb'],
  ['opamp-cmrr-corner-hz', 'cmrrCornerHz'],
] as const;

function parseNumber(option: string, text: string): number {
  const value = toNumber(text);
  if (Number.isNaN(value)) {
    throw new EngineInputError(`--${option} must be a number (optionally with k, M or G), got "${text}"`, { field: option });
  }
  return value;
}

function parseResistance(option: string, text: string | undefined, required: boolean): number | undefined {
  if (text === undefined) {
    if (required) throw new EngineInputError(`--${option} is required (ohms)`, { field: option });
    return undefined;
  }
  const value = parseNumber(option, text);
  if (!Number.isFinite(value) || (required ? value <= 0 : value < 0)) {
    throw new EngineInputError(`--${option} must be a resistance ${required ? 'above 0' : 'of at least 0'} ohms, got "${text}"`, {
      field: option,
    });
  }
  return value;
}

function parseFrequencies(text: string | undefined): number[] {
  if (text === undefined) throw new EngineInputError('--frequencies is required (Hz, comma-separated)', { field: 'frequencies' });
  return text.split(',').map((entry, index) => {
    const value = toNumber(entry);
    if (!Number.isFinite(value) || value < 0) {
      throw new EngineInputError(`--frequencies entry ${index + 1} must be a frequency of at least 0 Hz, got "${entry}"`, {
        field: 'frequencies',
        column: index + 1,
      });
    }
    return value;
  });
}

function parseOpAmp(values: Record<string, string | boolean | undefined>): OpAmpModel | undefined {
  const given = opAmpOptions.filter(([option]) => values[option] !== undefined);
  if (given.length === 0) return undefined;
  const missing = opAmpOptions.filter(([option]) => values[option] === undefined).map(([option]) => `--${option}`);
  if (missing.length > 0) {
    throw new EngineInputError(
      `op-amp data is incomplete: ${missing.join(', ')} ${missing.length === 1 ? 'is' : 'are'} missing (give --open-loop-gain-db, --gbw-hz, --opamp-cmrr-db and --opamp-cmrr-corner-hz together, or none for an ideal op-amp)`,
      { field: missing[0].slice(2) },
    );
  }
  const number = (option: (typeof opAmpOptions)[number][0]) => parseNumber(option, values[option] as string);
  const opAmp: OpAmpModel = {
    openLoopGainDb: number('open-loop-gain-db'),
    gainBandwidthHz: number('gbw-hz'),
    cmrrDb: number('opamp-cmrr-db'),
    cmrrCornerHz: number('opamp-cmrr-corner-hz'),
  };
  const checks: [(typeof opAmpOptions)[number][0], number, boolean, string][] = [
    ['open-loop-gain-db', opAmp.openLoopGainDb, opAmp.openLoopGainDb > 0, 'above 0 dB'],
    ['gbw-hz', opAmp.gainBandwidthHz, opAmp.gainBandwidthHz > 0, 'above 0 Hz'],
    ['opamp-cmrr-db', opAmp.cmrrDb, true, 'a finite level in dB'],
    ['opamp-cmrr-corner-hz', opAmp.cmrrCornerHz, opAmp.cmrrCornerHz > 0, 'above 0 Hz'],
  ];
  for (const [option, value, ok, requirement] of checks) {
    if (!ok || !Number.isFinite(value)) {
      throw new EngineInputError(`--${option} must be ${requirement}, got "${values[option] as string}"`, { field: option });
    }
  }
  return opAmp;
}

/** JSON has no Infinity or NaN: they become null. */
function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function formatDb(value: number): string {
  if (value === Infinity) return '∞';
  if (value === -Infinity) return '−∞';
  return value.toFixed(3);
}

function formatFrequency(value: number): string {
  return Number(value.toPrecision(6)).toString();
}


function pointJson(point: DifferenceAmplifierPrediction) {
  return {
    frequencyHz: point.frequencyHz,
    adDb: finiteOrNull(point.adDb),
    acmDb: finiteOrNull(point.acmDb),
    cmrrDb: finiteOrNull(point.cmrrDb),
    cmrrOppositeSignDb: finiteOrNull(point.cmrrOppositeSignDb),
    adPhaseDeg: phaseDegComplex(point.differentialGain),
    acmPhaseDeg: point.acmDb === -Infinity ? null : phaseDegComplex(point.commonModeGain),
    adOppositeSignDb: finiteOrNull(point.adOppositeSignDb),
    acmOppositeSignDb: finiteOrNull(point.acmOppositeSignDb),
    cmrrBandLowDb: finiteOrNull(point.cmrrBandLowDb),
    cmrrBandHighDb: finiteOrNull(point.cmrrBandHighDb),
  };
}

export async function run(args: string[]): Promise<number> {
  const parsed = parseCommandArgs('predict', usage, {
    args,
    allowPositionals: false,
    options: {
      r1: { type: 'string' },
      r2: { type: 'string' },
      r3: { type: 'string' },
      r4: { type: 'string' },
      rs1: { type: 'string' },
      rs2: { type: 'string' },
      'open-loop-gain-db': { type: 'string' },
      'gbw-hz': { type: 'string' },
      'opamp-cmrr-db': { type: 'string' },
      'opamp-cmrr-corner-hz': { type: 'string' },
      frequencies: { type: 'string' },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h' },
    },
  });
  if (typeof parsed === 'number') return parsed;
  const { values } = parsed;
  const resistors: DifferenceAmplifierResistors = {
    r1Ohms: parseResistance('r1', values.r1, true) as number,
    r2Ohms: parseResistance('r2', values.r2, true) as number,
    r3Ohms: parseResistance('r3', values.r3, true) as number,
    r4Ohms: parseResistance('r4', values.r4, true) as number,
    sourceResistance1Ohms: parseResistance('rs1', values.rs1, false) ?? 0,
    sourceResistance2Ohms: parseResistance('rs2', values.rs2, false) ?? 0,
  };
  const opAmp = parseOpAmp(values);
  const frequenciesHz = parseFrequencies(values.frequencies);
  const points = predictDifferenceAmplifier(frequenciesHz, resistors, opAmp);

  if (values.json) {
    const document = {
      circuit: {
        r1Ohms: resistors.r1Ohms,
        r2Ohms: resistors.r2Ohms,
        r3Ohms: resistors.r3Ohms,
        r4Ohms: resistors.r4Ohms,
        rs1Ohms: resistors.sourceResistance1Ohms,
        rs2Ohms: resistors.sourceResistance2Ohms,
      },
      opAmp: opAmp ?? null,
      points: points.map(pointJson),
    };
    process.stdout.write(`${JSON.stringify(document, null, 2)}\n`);
    return 0;
  }
  const opAmpText = opAmp
    ? `op-amp A0 ${opAmp.openLoopGainDb} dB, GBW ${opAmp.gainBandwidthHz} Hz, CMRR ${opAmp.cmrrDb} dB falling 20 dB/decade above ${opAmp.cmrrCornerHz} Hz`
    : 'ideal op-amp';
  const heading =
    `difference amplifier R1 ${resistors.r1Ohms} Ω, R2 ${resistors.r2Ohms} Ω, R3 ${resistors.r3Ohms} Ω, R4 ${resistors.r4Ohms} Ω, ` +
    `Rs1 ${resistors.sourceResistance1Ohms} Ω, Rs2 ${resistors.sourceResistance2Ohms} Ω; ${opAmpText}`;
  const rows = [
    ['frequency (Hz)', 'Ad (dB)', 'Acm (dB)', 'CMRR (dB)', 'CMRR, opposite sign (dB)'],
    ...points.map((point) => [
      formatFrequency(point.frequencyHz),
      formatDb(point.adDb),
      formatDb(point.acmDb),
      formatDb(point.cmrrDb),
      formatDb(point.cmrrOppositeSignDb),
    ]),
  ];
  process.stdout.write(`${heading}\n\n${formatTable(rows, () => true)}\n`);
  return 0;
}
