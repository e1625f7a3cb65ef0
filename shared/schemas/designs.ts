import { z } from 'zod';
import { finiteNumber, nonNegativeNumber, optionalText, positiveNumber, shortText } from './common';

export const topologies = ['difference-amplifier', 'instrumentation-amplifier'] as const;
export type Topology = (typeof topologies)[number];
export const topologyLabels: Record<Topology, string> = {
  'difference-amplifier': 'Four-resistor difference amplifier',
  'instrumentation-amplifier': 'Three-op-amp instrumentation amplifier',
};

/** Every resistor a stored circuit can hold (the instrumentation amplifier's input stage adds three). */
export const circuitResistorKeys = ['r1', 'r2', 'r3', 'r4', 'feedback1', 'feedback2', 'gainResistor'] as const;
export type CircuitResistorKey = (typeof circuitResistorKeys)[number];
/** How a schematic labels each resistor. */
export const circuitResistorLabels: Record<CircuitResistorKey, string> = {
  r1: 'R1',
  r2: 'R2',
  r3: 'R3',
  r4: 'R4',
  feedback1: 'RF1',
  feedback2: 'RF2',
  gainResistor: 'RG',
};
/** The resistors of each topology, in schematic order. */
export const topologyResistorKeys: Record<Topology, readonly CircuitResistorKey[]> = {
  'difference-amplifier': ['r1', 'r2', 'r3', 'r4'],
  'instrumentation-amplifier': ['feedback1', 'feedback2', 'gainResistor', 'r1', 'r2', 'r3', 'r4'],
};

const tolerance = (what: string) =>
  finiteNumber(what).refine((value) => value > 0 && value < 0.5, `${what} must be a fraction between 0 and 0.5 (0.001 = 0.1 %)`);

/** Single-pole op-amp data (DOMAIN.md); all four or none. */
export const opAmpSchema = z.object({
  partNumber: shortText('Op-amp part number', 80),
  openLoopGainDb: finiteNumber('Open-loop gain').refine((value) => value > 0 && value < 250, 'Open-loop gain must be between 0 and 250 dB'),
  gainBandwidthHz: positiveNumber('Gain-bandwidth product'),
  cmrrDb: finiteNumber('Op-amp CMRR').refine((value) => value > 0 && value < 250, 'Op-amp CMRR must be between 0 and 250 dB'),
  cmrrCornerHz: positiveNumber('Op-amp CMRR corner'),
});
export type OpAmpData = z.infer<typeof opAmpSchema>;

export const resistorSchema = z.object({
  ohms: positiveNumber('Resistance'),
  tolerance: tolerance('Tolerance'),
});

export const differenceAmplifierCircuitSchema = z.object({
  topology: z.literal('difference-amplifier'),
  r1: resistorSchema,
  r2: resistorSchema,
  r3: resistorSchema,
  r4: resistorSchema,
  sourceResistance1Ohms: nonNegativeNumber('Source resistance 1').default(0),
  sourceResistance2Ohms: nonNegativeNumber('Source resistance 2').default(0),
  toleranceDistribution: z.enum(['uniform', 'normal']).default('uniform'),
  opAmp: opAmpSchema.nullable().default(null),
});

export const instrumentationAmplifierCircuitSchema = z.object({
  topology: z.literal('instrumentation-amplifier'),
  feedback1: resistorSchema,
  feedback2: resistorSchema,
  gainResistor: resistorSchema,
  r1: resistorSchema,
  r2: resistorSchema,
  r3: resistorSchema,
  r4: resistorSchema,
  sourceResistance1Ohms: nonNegativeNumber('Source resistance 1').default(0),
  sourceResistance2Ohms: nonNegativeNumber('Source resistance 2').default(0),
  toleranceDistribution: z.enum(['uniform', 'normal']).default('uniform'),
  /** The same op-amp type in all three positions (a dual or quad part, as usual). */
  opAmp: opAmpSchema.nullable().default(null),
});

export const circuitSchema = z.discriminatedUnion('topology', [differenceAmplifierCircuitSchema, instrumentationAmplifierCircuitSchema], {
  error: `Topology must be one of: ${topologies.join(', ')}`,
});
export type Circuit = z.infer<typeof circuitSchema>;
export type DifferenceAmplifierCircuit = z.infer<typeof differenceAmplifierCircuitSchema>;
export type InstrumentationAmplifierCircuitData = z.infer<typeof instrumentationAmplifierCircuitSchema>;

export const limitMaskSchema = z.object({
  points: z
    .array(z.object({ frequencyHz: positiveNumber('Mask frequency'), minimumCmrrDb: finiteNumber('Minimum CMRR') }))
    .min(1, 'A limit mask needs at least one point')
    .max(50, 'A limit mask has at most 50 points')
    .refine(
      (points) => points.every((point, index) => index === 0 || point.frequencyHz > points[index - 1].frequencyHz),
      'Mask frequencies must rise strictly from one point to the next',
    ),
  /** Guard band for pass/fail decisions (ILAC-G8 guarded acceptance), dB. */
  guardBandDb: nonNegativeNumber('Guard band').default(0),
});
export type LimitMaskData = z.infer<typeof limitMaskSchema>;

export const designRevisionInputSchema = z.object({
  label: shortText('Revision label', 40),
  circuit: circuitSchema,
  limitMask: limitMaskSchema,
  changeNote: optionalText('Change note', 2000),
});
export type DesignRevisionInput = z.input<typeof designRevisionInputSchema>;
/** A revision as validated (defaults filled in). */
export type DesignRevisionData = z.output<typeof designRevisionInputSchema>;

export const createDesignSchema = z.object({
  name: shortText('Design name', 120),
  description: optionalText('Description', 4000),
  revision: designRevisionInputSchema,
});
export type CreateDesignInput = z.input<typeof createDesignSchema>;
export type CreateDesignData = z.output<typeof createDesignSchema>;

export interface DesignRevision {
  id: string;
  designId: string;
  revision: number;
  label: string;
  circuit: Circuit;
  limitMask: LimitMaskData;
  changeNote: string;
  createdBy: { id: string; name: string };
  createdAt: string;
  /** Bench sessions measured against this revision. */
  sessionCount: number;
}

export interface DesignSummary {
  id: string;
  name: string;
  description: string;
  latestRevision: Pick<DesignRevision, 'id' | 'revision' | 'label' | 'createdAt'> & { topology: Topology };
  revisionCount: number;
  sessionCount: number;
  createdAt: string;
}

export interface DesignDetail {
  id: string;
  name: string;
  description: string;
  createdAt: string;
  createdBy: { id: string; name: string };
  /** Newest first. */
  revisions: DesignRevision[];
}
