// Writes the demo sweeps in sample-data/sweeps/: differential and common-mode frequency sweeps of
// boards in the fictional Halden Ridge Instruments lab, built from the first-order model of
// DOMAIN.md with seeded noise, plus manifest.json with the parameters each pair was made from.
// Deterministic, so the files are reproducible: `node --import tsx scripts/sample-data/sweeps.ts`.
//
// Every number here is invented demo data.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

interface SweepPairSpec {
  /** File stem: `<stem>-differential.csv` and `<stem>-common-mode.csv`. */
  stem: string;
  board: string;
  serial: string;
  note: string[];
  /** Closed-loop gain Ad0 and bandwidth fp (Hz). */
  differentialGain: number;
  bandwidthHz: number;
  /** CMRR at dc (dB) and its −3 dB corner Acm0/k (Hz). */
  cmrrDcDb: number;
  cmrrCornerHz: number;
  differentialDriveVolts: number;
  commonModeDriveVolts: number;
  differentialFrequencies: number[];
  commonModeFrequencies: number[];
  /** Output noise floor (V): `floorVolts·sqrt(1 + (flickerCornerHz/f)²)`, rising below the corner (1/f, hum). */
  floorVolts: number;
  flickerCornerHz: number;
  /** Reading scatter in dB (1 σ) on each channel. */
  differentialScatterDb: number;
  commonModeScatterDb: number;
  delimiter: ',' | ';';
  decimalComma: boolean;
  fallingOrder: boolean;
  /** Common-mode frequencies (nearest grid point) measured a second time (the file then needs --average-repeats). */
  repeatedHz: number[];
  seed: number;
}

function logSpaced(startHz: number, stopHz: number, perDecade: number): number[] {
  const count = Math.round(Math.log10(stopHz / startHz) * perDecade) + 1;
  return Array.from({ length: count }, (_, i) => Number((startHz * 10 ** (i / perDecade)).toPrecision(4)));
}

const standardBand = logSpaced(10, 1e6, 10);

const specs: SweepPairSpec[] = [
  {
    stem: 'hrb204-0007',
    board: 'LC-Bridge front-end board HRB-204',
    serial: 'HRB204-0007',
    note: ['standard build, 0.1 % thin-film network; rejection limited by the network below about 8 kHz'],
    differentialGain: 10,
    bandwidthHz: 150e3,
    cmrrDcDb: 84,
    cmrrCornerHz: 8e3,
    differentialDriveVolts: 0.1,
    commonModeDriveVolts: 1,
    differentialFrequencies: standardBand,
    commonModeFrequencies: standardBand,
    floorVolts: 2e-6,
    flickerCornerHz: 100,
    differentialScatterDb: 0.02,
    commonModeScatterDb: 0.3,
    delimiter: ',',
    decimalComma: false,
    fallingOrder: false,
    repeatedHz: [],
    seed: 2040007,
  },
  {
    stem: 'hrb204-0012-floor-limited',
    board: 'LC-Bridge front-end board HRB-204',
    serial: 'HRB204-0012',
    note: [
      'trimmed network: below about 100 Hz the common-mode output sinks into the 1/f floor,',
      'so those points are lower bounds on CMRR',
    ],
    differentialGain: 10,
    bandwidthHz: 150e3,
    cmrrDcDb: 112,
    cmrrCornerHz: 1.5e3,
    differentialDriveVolts: 0.1,
    commonModeDriveVolts: 1,
    differentialFrequencies: standardBand,
    commonModeFrequencies: standardBand,
    floorVolts: 3e-6,
    flickerCornerHz: 300,
    differentialScatterDb: 0.02,
    commonModeScatterDb: 0.4,
    delimiter: ',',
    decimalComma: false,
    fallingOrder: false,
    repeatedHz: [],
    seed: 2040012,
  },
  {
    stem: 'hrb311-0003-falling',
    board: 'current-sense stage HRB-311',
    serial: 'HRB311-0003',
    note: ['swept from the top frequency down (the reader sorts it)'],
    differentialGain: 20,
    bandwidthHz: 400e3,
    cmrrDcDb: 76,
    cmrrCornerHz: 30e3,
    differentialDriveVolts: 0.05,
    commonModeDriveVolts: 2,
    differentialFrequencies: logSpaced(20, 500e3, 10),
    commonModeFrequencies: logSpaced(20, 500e3, 10),
    floorVolts: 5e-6,
    flickerCornerHz: 50,
    differentialScatterDb: 0.02,
    commonModeScatterDb: 0.25,
    delimiter: ',',
    decimalComma: false,
    fallingOrder: true,
    repeatedHz: [],
    seed: 3110003,
  },
  {
    stem: 'hrb204-0021-semicolon',
    board: 'LC-Bridge front-end board HRB-204',
    serial: 'HRB204-0021',
    note: [
      'exported from a spreadsheet with semicolons and decimal commas; the differential sweep has',
      '5 points a decade, the common-mode sweep 10 (the differential gain is interpolated);',
      'the points near 1 kHz and 10 kHz were measured twice: analyze with --average-repeats',
    ],
    differentialGain: 10,
    bandwidthHz: 150e3,
    cmrrDcDb: 88,
    cmrrCornerHz: 6e3,
    differentialDriveVolts: 0.1,
    commonModeDriveVolts: 1,
    differentialFrequencies: logSpaced(10, 1e6, 5),
    commonModeFrequencies: logSpaced(20, 500e3, 10),
    floorVolts: 2e-6,
    flickerCornerHz: 100,
    differentialScatterDb: 0.02,
    commonModeScatterDb: 0.3,
    delimiter: ';',
    decimalComma: true,
    fallingOrder: false,
    repeatedHz: [1000, 10000],
    seed: 2040021,
  },
];

function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => Math.sqrt(-2 * Math.log(1 - uniformFloat64(rng))) * Math.cos(2 * Math.PI * uniformFloat64(rng));
}

function formatNumber(value: number, decimalComma: boolean): string {
  const text = String(Number(value.toPrecision(6)));
  return decimalComma ? text.replace('.', ',') : text;
}

/** Phase of a one-pole response at `frequencyHz`, degrees. */
function poleAngleDeg(frequencyHz: number, poleHz: number): number {
  return (-Math.atan(frequencyHz / poleHz) * 180) / Math.PI;
}

function writeSweep(spec: SweepPairSpec, drive: 'differential' | 'common-mode', directory: string): string {
  const gaussian = gaussianSource(spec.seed + (drive === 'differential' ? 0 : 1));
  const frequencies = drive === 'differential' ? spec.differentialFrequencies : spec.commonModeFrequencies;
  const vinVolts = drive === 'differential' ? spec.differentialDriveVolts : spec.commonModeDriveVolts;
  const acm0 = spec.differentialGain / 10 ** (spec.cmrrDcDb / 20);
  const kPerHz = acm0 / spec.cmrrCornerHz;
  const rows: string[] = [];
  const emit = (frequencyHz: number) => {
    const pole = Math.sqrt(1 + (frequencyHz / spec.bandwidthHz) ** 2);
    const floorVolts = spec.floorVolts * Math.sqrt(1 + (spec.flickerCornerHz / frequencyHz) ** 2);
    let gain: number;
    let phaseDeg = poleAngleDeg(frequencyHz, spec.bandwidthHz);
    if (drive === 'differential') {
      gain = (spec.differentialGain / pole) * 10 ** ((spec.differentialScatterDb * gaussian()) / 20);
    } else {
      gain = (Math.sqrt(acm0 ** 2 + (kPerHz * frequencyHz) ** 2) / pole) * 10 ** ((spec.commonModeScatterDb * gaussian()) / 20);
      phaseDeg += (Math.atan2(kPerHz * frequencyHz, acm0) * 180) / Math.PI;
    }
    // A narrowband reading is the magnitude of the signal phasor plus a noise phasor; the floor
    // written in the file is taken as a 3σ level of that noise (σ = floor/3 per quadrature).
    const signalVolts = gain * vinVolts;
    const inPhaseVolts = signalVolts + (floorVolts / 3) * gaussian();
    const quadratureVolts = (floorVolts / 3) * gaussian();
    const readingVolts = Math.hypot(inPhaseVolts, quadratureVolts);
    const cells = [frequencyHz, vinVolts, readingVolts, phaseDeg, floorVolts].map((value) =>
      formatNumber(value, spec.decimalComma),
    );
    rows.push(cells.join(spec.delimiter));
  };
  for (const frequencyHz of frequencies) {
    emit(frequencyHz);
    // Repeats at the grid frequency nearest each listed one (the grid is rounded to 4 digits).
    const repeated = spec.repeatedHz.some((hz) => Math.abs(Math.log10(frequencyHz / hz)) < 0.05);
    if (drive === 'common-mode' && repeated) emit(frequencyHz);
  }
  if (spec.fallingOrder) rows.reverse();

  const file = `${spec.stem}-${drive}.csv`;
  const header = ['frequency_hz', 'vin_v', 'vout_v', 'phase_deg', 'floor_v'].join(spec.delimiter);
  const lines = [
    `# Halden Ridge Instruments lab - ${spec.board}, serial ${spec.serial}`,
    `# ${drive} drive, ${vinVolts} V peak; amplitudes in volts peak from a sine fit, phase in degrees,`,
    '# floor_v = output noise floor in the same bandwidth',
    ...spec.note.map((line) => `# ${line}`),
    header,
    ...rows,
  ];
  writeFileSync(join(directory, file), `${lines.join('\n')}\n`);
  return file;
}

const directory = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'sample-data', 'sweeps');
mkdirSync(directory, { recursive: true });
const manifest = specs.map((spec) => ({
  differential: writeSweep(spec, 'differential', directory),
  commonMode: writeSweep(spec, 'common-mode', directory),
  serial: spec.serial,
  board: spec.board,
  model: {
    differentialGain: spec.differentialGain,
    bandwidthHz: spec.bandwidthHz,
    cmrrDcDb: spec.cmrrDcDb,
    cmrrCornerHz: spec.cmrrCornerHz,
    floorVolts: spec.floorVolts,
    flickerCornerHz: spec.flickerCornerHz,
    commonModeScatterDb: spec.commonModeScatterDb,
  },
  needsAverageRepeats: spec.repeatedHz.length > 0,
  seed: spec.seed,
}));
writeFileSync(join(directory, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`);
process.stdout.write(`wrote ${manifest.length * 2} sweeps and manifest.json to ${directory}\n`);
