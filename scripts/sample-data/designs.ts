// Writes the demo designs in sample-data/designs/: resistor networks, op-amp data and limit masks of
// boards in the fictional Halden Ridge Instruments lab, in the shape the design API accepts
// (shared/schemas/designs.ts, checked here), plus manifest.json with what the engine predicts for
// each and the matching `rejectra predict` / `rejectra tolerance` command lines. Deterministic:
// `node --import tsx scripts/sample-data/designs.ts`.
//
// Every number here is invented demo data; the op-amp part numbers are fictional. The boards'
// circuits come from server/demo/fictional-boards.ts, as in the demo scenario.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { bridgeFrontEndCircuit, currentSenseCircuit, currentSenseMask, fictionalOpAmp } from '../../server/demo/fictional-boards';
import {
  monteCarloCmrr,
  predictDifferenceAmplifier,
  predictInstrumentationAmplifier,
  worstCaseNetworkCmrrDb,
  type OpAmpModel,
} from '../../shared/engine';
import { createDesignSchema, type CreateDesignInput } from '../../shared/schemas/designs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const folder = join(root, 'sample-data', 'designs');

const designs: { file: string; serialPrefix: string; design: CreateDesignInput }[] = [
  {
    file: 'hrb204-front-end-rev-c.json',
    serialPrefix: 'HRB204',
    design: {
      name: 'LC-Bridge front-end board HRB-204',
      description: 'Difference amplifier after a 350 Ω strain bridge; gain 10. Demo design of the Halden Ridge Instruments lab.',
      revision: {
        label: 'rev C',
        changeNote: 'R1–R4 moved from 1 % thick film to a 0.1 % thin-film set.',
        circuit: bridgeFrontEndCircuit({ sourceOhms: [175, 176.5] }),
        limitMask: {
          points: [
            { frequencyHz: 10, minimumCmrrDb: 66 },
            { frequencyHz: 1000, minimumCmrrDb: 66 },
            { frequencyHz: 20000, minimumCmrrDb: 55 },
          ],
          guardBandDb: 1,
        },
      },
    },
  },
  {
    file: 'hrb311-current-sense-rev-a.json',
    serialPrefix: 'HRB311',
    design: {
      name: 'Current-sense stage HRB-311',
      description: 'Three-op-amp instrumentation amplifier across a shunt on a 48 V rail; input-stage gain 50.8. Demo design.',
      revision: {
        label: 'rev A',
        changeNote: 'First release.',
        circuit: currentSenseCircuit(),
        limitMask: currentSenseMask,
      },
    },
  },
];

const round = (value: number, digits = 2) => Number(value.toFixed(digits));

mkdirSync(folder, { recursive: true });
const manifest = designs.map(({ file, serialPrefix, design }) => {
  const checked = createDesignSchema.parse(design);
  writeFileSync(join(folder, file), `${JSON.stringify(design, null, 2)}\n`);
  const circuit = checked.revision.circuit;
  const { partNumber: _partNumber, ...opAmpData } = circuit.opAmp ?? fictionalOpAmp;
  const opAmp: OpAmpModel = opAmpData;
  const frequenciesHz = [10, 100, 1000, 10000, 100000];
  const stage = {
    r1Ohms: circuit.r1.ohms,
    r2Ohms: circuit.r2.ohms,
    r3Ohms: circuit.r3.ohms,
    r4Ohms: circuit.r4.ohms,
    sourceResistance1Ohms: circuit.topology === 'difference-amplifier' ? circuit.sourceResistance1Ohms : 0,
    sourceResistance2Ohms: circuit.topology === 'difference-amplifier' ? circuit.sourceResistance2Ohms : 0,
  };
  const network = {
    ...stage,
    toleranceFractions: [circuit.r1.tolerance, circuit.r2.tolerance, circuit.r3.tolerance, circuit.r4.tolerance] as [number, number, number, number],
  };
  const monteCarlo = monteCarloCmrr({ network, trials: 200_000, seed: 311, distribution: circuit.toleranceDistribution });
  const predicted =
    circuit.topology === 'difference-amplifier'
      ? predictDifferenceAmplifier(frequenciesHz, stage, opAmp)
      : predictInstrumentationAmplifier(
          frequenciesHz,
          {
            feedbackResistance1Ohms: circuit.feedback1.ohms,
            feedbackResistance2Ohms: circuit.feedback2.ohms,
            gainResistanceOhms: circuit.gainResistor.ohms,
            differenceStage: stage,
          },
          { input1: opAmp, input2: opAmp, difference: opAmp },
        );
  const opAmpArgs = `--open-loop-gain-db ${opAmp.openLoopGainDb} --gbw-hz ${opAmp.gainBandwidthHz} --opamp-cmrr-db ${opAmp.cmrrDb} --opamp-cmrr-corner-hz ${opAmp.cmrrCornerHz}`;
  return {
    file,
    board: design.name,
    serialPrefix,
    topology: circuit.topology,
    nominalPrediction: predicted.map((point) => ({
      frequencyHz: point.frequencyHz,
      cmrrDb: round(point.cmrrDb),
      cmrrBandLowDb: round(point.cmrrBandLowDb),
      cmrrBandHighDb: round(point.cmrrBandHighDb),
    })),
    differenceStageResistorTolerance: {
      worstCaseDb: round(worstCaseNetworkCmrrDb(network)),
      monteCarlo: { trials: 200_000, seed: 311, p05Db: round(monteCarlo.p05Db), p50Db: round(monteCarlo.p50Db), p95Db: round(monteCarlo.p95Db) },
    },
    ...(circuit.topology === 'difference-amplifier'
      ? {
          predictCommand:
            `npm run --silent cli -- predict --r1 ${stage.r1Ohms} --r2 ${stage.r2Ohms} --r3 ${stage.r3Ohms} --r4 ${stage.r4Ohms} ` +
            `--rs1 ${stage.sourceResistance1Ohms} --rs2 ${stage.sourceResistance2Ohms} ${opAmpArgs} --frequencies ${frequenciesHz.join(',')}`,
          toleranceCommand: `npm run --silent cli -- tolerance --gain ${stage.r2Ohms / stage.r1Ohms} --tolerance ${circuit.r1.tolerance} --series E96`,
        }
      : {}),
  };
});
writeFileSync(join(folder, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`);
process.stdout.write(`wrote ${designs.length} designs and manifest.json to ${folder}\n`);
