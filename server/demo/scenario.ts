// The demo scenario: the Halden Ridge Instruments lab (fictional), its load-cell bridge front-end
// board HRB-204 in two revisions, a current-sense stage HRB-311 (their circuits and masks from
// ./fictional-boards.ts), bench instruments, and a lot of units measured against them. Every number
// here is invented for the demo; the readings are made from the engine's own circuit model with
// seeded per-unit resistor errors and noise, and some from synthetic captures run through the sine
// fit, so every page has something real to show.
import {
  createSeededRandom,
  fitCapture,
  predictDifferenceAmplifier,
  predictInstrumentationAmplifier,
  type DifferenceAmplifierPrediction,
  type SeededRandom,
} from '../../shared/engine';
import type { Drive } from '../../shared/schemas/bench-sessions';
import type { CreateDesignData, DesignRevisionData, DifferenceAmplifierCircuit, InstrumentationAmplifierCircuitData } from '../../shared/schemas/designs';
import type { InstrumentInput } from '../../shared/schemas/instruments';
import type { SweepMode } from '../../shared/schemas/sweeps';
import type { PointRow } from '../operations/sweep-points';
import { bridgeFrontEndCircuit, bridgeFrontEndMask, currentSenseCircuit, currentSenseMask, fictionalOpAmp } from './fictional-boards';

export const demoLab = 'Halden Ridge Instruments lab';

export const demoDesigns: { design: Omit<CreateDesignData, 'revision'>; revisions: DesignRevisionData[] }[] = [
  {
    design: {
      name: 'LC-Bridge front-end board HRB-204',
      description: `Difference amplifier after a 350 Ω strain bridge, gain 10. ${demoLab}.`,
    },
    revisions: [
      { label: 'rev C', circuit: bridgeFrontEndCircuit({ tolerance: 0.001 }), limitMask: bridgeFrontEndMask, changeNote: 'R1–R4 moved from 1 % thick film to a 0.1 % thin-film set.' },
      { label: 'rev D', circuit: bridgeFrontEndCircuit({ tolerance: 0.0001 }), limitMask: bridgeFrontEndMask, changeNote: 'Matched 0.01 % network for lot 2: two of eight rev C units fell below the 80 dB limit.' },
    ],
  },
  {
    design: {
      name: 'Current-sense stage HRB-311',
      description: `Three-op-amp instrumentation amplifier across a shunt on an 80 V motor rail. ${demoLab}.`,
    },
    revisions: [
      {
        label: 'rev A',
        circuit: currentSenseCircuit(),
        limitMask: currentSenseMask,
        changeNote: 'First release.',
      },
    ],
  },
];

export const demoInstruments: Required<Omit<InstrumentInput, 'retired'>>[] = [
  { name: 'Tone generator TG-2', kind: 'signal generator', manufacturer: 'Halden Ridge', model: 'TG-2', serialNumber: 'TG2-10877', calibratedOn: '2026-03-02', calibrationDueOn: '2027-03-02', notes: 'Balanced output, 600 Ω.' },
  { name: 'Selective analyser SA-9', kind: 'audio analyser', manufacturer: 'Nordvik Test', model: 'SA-9', serialNumber: 'SA9-2231', calibratedOn: '2025-12-15', calibrationDueOn: '2026-12-15', notes: '1 Hz resolution bandwidth for common-mode readings.' },
  { name: 'Lock-in LI-3', kind: 'lock-in amplifier', manufacturer: 'Nordvik Test', model: 'LI-3', serialNumber: 'LI3-00412', calibratedOn: '2025-06-30', calibrationDueOn: '2026-06-30', notes: 'Sent for calibration; do not use for records.' },
  { name: 'Differential probe DP-100', kind: 'differential probe', manufacturer: 'Halden Ridge', model: 'DP-100', serialNumber: 'DP100-0093', calibratedOn: '2026-08-01', calibrationDueOn: '2027-08-01', notes: '1000 V CAT II; for the 80 V rail tests.' },
  { name: 'Bridge fixture BF-2', kind: 'fixture', manufacturer: 'Halden Ridge (in-house)', model: 'BF-2', serialNumber: 'BF2-001', calibratedOn: null, calibrationDueOn: null, notes: 'Balanced 175 Ω source arms, matched to 0.1 Ω.' },
];

export interface DemoSweep {
  mode: SweepMode;
  source: 'demo' | 'captures';
  sourceName: string;
  points: PointRow[];
}

export interface DemoSession {
  designName: string;
  revisionLabel: string;
  unitSerial: string;
  fixture: string;
  ambientTemperatureC: number;
  instrumentSerials: string[];
  operatorEmail: string;
  measuredAt: string;
  differentialDrive: Drive;
  commonModeDrive: Drive;
  notes: string;
  archived: boolean;
  sweeps: DemoSweep[];
}

const frequenciesHz = Array.from({ length: 25 }, (_, index) => 10 * 10_000 ** (index / 24));

/** A normal deviate (Box–Muller) from the seeded generator. */
function gaussian(random: SeededRandom): number {
  const u = 1 - random.nextFloat64();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random.nextFloat64());
}

interface UnitModel {
  /** Relative deviation of R1…R4 from nominal. */
  deviations: [number, number, number, number];
  opAmpCmrrDb: number;
  opAmpSign: 1 | -1;
  floorV: number;
  /** Relative imbalance of the fixture's source arms (Rs2 vs Rs1). */
  sourceImbalance: number;
}

function unitPrediction(circuit: DifferenceAmplifierCircuit, unit: UnitModel): DifferenceAmplifierPrediction[] {
  const [d1, d2, d3, d4] = unit.deviations;
  return predictDifferenceAmplifier(
    frequenciesHz,
    {
      r1Ohms: circuit.r1.ohms * (1 + d1),
      r2Ohms: circuit.r2.ohms * (1 + d2),
      r3Ohms: circuit.r3.ohms * (1 + d3),
      r4Ohms: circuit.r4.ohms * (1 + d4),
      sourceResistance1Ohms: circuit.sourceResistance1Ohms,
      sourceResistance2Ohms: circuit.sourceResistance2Ohms * (1 + unit.sourceImbalance),
    },
    { ...fictionalOpAmp, cmrrDb: unit.opAmpCmrrDb },
  );
}

/** Readings as an analyser would give them: the true level with 0.2 % reading noise, plus the floor's noise. */
function readings(mode: SweepMode, predictions: DifferenceAmplifierPrediction[], drive: Drive, unit: UnitModel, random: SeededRandom): PointRow[] {
  return predictions.map((prediction, index) => {
    const gainDb = mode === 'differential' ? (unit.opAmpSign === 1 ? prediction.adDb : prediction.adOppositeSignDb) : unit.opAmpSign === 1 ? prediction.acmDb : prediction.acmOppositeSignDb;
    const trueVolts = drive.acVolts * 10 ** (gainDb / 20);
    const noisy = Math.abs(trueVolts * (1 + 0.002 * gaussian(random)) + unit.floorV * 0.3 * gaussian(random));
    return {
      sequence: index + 1,
      frequencyHz: Number(prediction.frequencyHz.toPrecision(6)),
      vinV: drive.acVolts,
      voutV: Number(noisy.toPrecision(5)),
      phaseDeg: null,
      floorV: unit.floorV,
      sourceLine: null,
    };
  });
}

/**
 * The same readings taken as two-channel captures (200 samples a cycle, 20 cycles) and fitted
 * with the IEEE Std 1057 sine fit, as the capture upload would.
 */
function captureReadings(mode: SweepMode, predictions: DifferenceAmplifierPrediction[], drive: Drive, unit: UnitModel, random: SeededRandom): PointRow[] {
  const amplitudePeak = drive.acVolts * Math.SQRT2;
  return predictions.map((prediction, index) => {
    const gainDb = mode === 'differential' ? prediction.adDb : prediction.acmDb;
    const gain = 10 ** (gainDb / 20);
    const sampleRateHz = prediction.frequencyHz * 200;
    const samples = 4000;
    const input = new Float64Array(samples);
    const output = new Float64Array(samples);
    const noisePeak = unit.floorV * Math.sqrt(samples);
    for (let sample = 0; sample < samples; sample++) {
      const phase = (2 * Math.PI * sample) / 200;
      input[sample] = amplitudePeak * Math.cos(phase) + 1e-6 * gaussian(random);
      output[sample] = amplitudePeak * gain * Math.cos(phase + 0.2) + noisePeak * gaussian(random);
    }
    const fit = fitCapture({ input, output, sampleRateHz, file: `capture ${index + 1}` }, { frequencyHz: prediction.frequencyHz });
    return {
      sequence: index + 1,
      frequencyHz: Number(prediction.frequencyHz.toPrecision(6)),
      vinV: fit.input.amplitude / Math.SQRT2,
      voutV: fit.output.amplitude / Math.SQRT2,
      phaseDeg: fit.phaseDeg,
      floorV: fit.output.residualRms / Math.sqrt(samples),
      sourceLine: null,
    };
  });
}

/** Every demo bench session with its sweeps; deterministic (seeded). */
export function demoSessions(): DemoSession[] {
  const random = createSeededRandom(204_2026);
  const bridge = demoDesigns[0];
  const sessions: DemoSession[] = [];
  const differentialDrive: Drive = { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 };
  const commonModeDrive: Drive = { acVolts: 1, acConvention: 'rms', dcVolts: 0 };
  const units = 14;
  for (let unitIndex = 0; unitIndex < units; unitIndex++) {
    const revision = unitIndex < 8 ? bridge.revisions[0] : bridge.revisions[1];
    const circuit = revision.circuit as DifferenceAmplifierCircuit;
    const tolerance = circuit.r1.tolerance;
    const serial = `HRB204-${String(unitIndex + 1).padStart(4, '0')}`;
    const deviations = [0, 1, 2, 3].map(() => tolerance * (2 * random.nextFloat64() - 1)) as UnitModel['deviations'];
    const floorLimited = serial === 'HRB204-0012';
    const unit: UnitModel = {
      // HRB204-0012 came out almost perfectly matched: at low frequency its common-mode output
      // sinks below the analyser's floor, so those points are lower bounds.
      deviations: floorLimited ? [0.2e-6, -0.1e-6, 0.1e-6, 0.3e-6] : deviations,
      opAmpCmrrDb: floorLimited ? 132 : 110 + 3 * gaussian(random),
      opAmpSign: random.nextFloat64() < 0.5 ? 1 : -1,
      floorV: floorLimited ? 4e-6 : 1.5e-6,
      sourceImbalance: floorLimited ? 0 : 0.0006 * gaussian(random),
    };
    const predictions = unitPrediction(circuit, unit);
    const fromCaptures = serial === 'HRB204-0004' || serial === 'HRB204-0010';
    const sweepsFor = (mode: SweepMode): DemoSweep =>
      fromCaptures
        ? { mode, source: 'captures', sourceName: `${predictions.length} captures`, points: captureReadings(mode, predictions, mode === 'differential' ? differentialDrive : commonModeDrive, unit, random) }
        : { mode, source: 'demo', sourceName: `${serial.toLowerCase()}-${mode}.csv`, points: readings(mode, predictions, mode === 'differential' ? differentialDrive : commonModeDrive, unit, random) };
    const day = new Date(Date.UTC(2026, 9, 5 + unitIndex * 3, 9 + (unitIndex % 5), 15));
    sessions.push({
      designName: bridge.design.name,
      revisionLabel: revision.label,
      unitSerial: serial,
      fixture: 'Bridge fixture BF-2, 175 Ω arms',
      ambientTemperatureC: Number((22.5 + 0.8 * gaussian(random)).toFixed(1)),
      instrumentSerials: ['TG2-10877', 'SA9-2231', 'BF2-001'],
      operatorEmail: unitIndex % 6 === 5 ? 'designer@rejectra.test' : 'tech@rejectra.test',
      measuredAt: day.toISOString(),
      differentialDrive,
      commonModeDrive,
      notes: floorLimited ? 'Common-mode output at the analyser floor below about 5 kHz; readings there are bounds.' : fromCaptures ? 'Readings from two-channel captures (sine fits).' : '',
      archived: unitIndex < 3,
      sweeps: [sweepsFor('differential'), sweepsFor('common-mode')],
    });
  }
  sessions.push(...currentSenseSessions(random));
  return sessions;
}

/** Two units of the current-sense stage, measured on the 80 V rail (hazardous drive, acknowledged). */
function currentSenseSessions(random: SeededRandom): DemoSession[] {
  const design = demoDesigns[1];
  const revision = design.revisions[0];
  const circuit = revision.circuit as InstrumentationAmplifierCircuitData;
  const differentialDrive: Drive = { acVolts: 0.01, acConvention: 'rms', dcVolts: 0 };
  return ['HRB311-0001', 'HRB311-0002'].map((serial, index) => {
    const vary = (resistor: { ohms: number; tolerance: number }) => resistor.ohms * (1 + resistor.tolerance * (2 * random.nextFloat64() - 1));
    const cmrrDb = 110 + 3 * gaussian(random);
    const predictions = predictInstrumentationAmplifier(
      frequenciesHz,
      {
        feedbackResistance1Ohms: vary(circuit.feedback1),
        feedbackResistance2Ohms: vary(circuit.feedback2),
        gainResistanceOhms: vary(circuit.gainResistor),
        differenceStage: { r1Ohms: vary(circuit.r1), r2Ohms: vary(circuit.r2), r3Ohms: vary(circuit.r3), r4Ohms: vary(circuit.r4) },
      },
      { input1: { ...fictionalOpAmp, cmrrDb }, input2: { ...fictionalOpAmp, cmrrDb: cmrrDb + 2 * gaussian(random) }, difference: fictionalOpAmp },
    );
    const floorV = 1.5e-6;
    const sweep = (mode: SweepMode): DemoSweep => ({
      mode,
      source: 'demo',
      sourceName: `${serial.toLowerCase()}-${mode}.csv`,
      points: predictions.map((prediction, point) => {
        const drive = mode === 'differential' ? differentialDrive.acVolts : demoHazardousDrive.acVolts;
        const gain = 10 ** ((mode === 'differential' ? prediction.adDb : prediction.acmDb) / 20);
        return {
          sequence: point + 1,
          frequencyHz: Number(prediction.frequencyHz.toPrecision(6)),
          vinV: drive,
          voutV: Number(Math.abs(drive * gain * (1 + 0.002 * gaussian(random)) + 0.5 * floorV * gaussian(random)).toPrecision(5)),
          phaseDeg: null,
          floorV,
          sourceLine: null,
        };
      }),
    });
    return {
      designName: design.design.name,
      revisionLabel: revision.label,
      unitSerial: serial,
      fixture: 'Rail fixture RF-80 with isolated common-mode injection',
      ambientTemperatureC: 24.0 + index * 0.4,
      instrumentSerials: ['TG2-10877', 'SA9-2231', 'DP100-0093'],
      operatorEmail: 'tech@rejectra.test',
      measuredAt: new Date(Date.UTC(2026, 10, 20 + index, 13, 40)).toISOString(),
      differentialDrive,
      commonModeDrive: demoHazardousDrive,
      notes: 'Common-mode drive rides on the 80 V rail: differential probe only, bench behind the interlocked shield.',
      archived: false,
      sweeps: [sweep('differential'), sweep('common-mode')],
    };
  });
}

/** The hazardous-drive sessions of the current-sense stage: 80 V dc motor rail plus a 1 V rms tone. */
export const demoHazardousDrive: Drive = { acVolts: 1, acConvention: 'rms', dcVolts: 80 };
