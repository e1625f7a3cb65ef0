// The live-streaming protocol: JSON messages over one WebSocket at /ws (docs/STREAMING.md).
import { z } from 'zod';
import type { SessionAnalysis } from './analysis';
import { sweepModeSchema } from './sweeps';

/** Largest message the server reads, bytes; larger ones are refused and the socket closed. */
export const maximumStreamMessageBytes = 1024 * 1024;
/** Most points one `points` message may carry. */
export const maximumPointsPerMessage = 5000;

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

export const streamPointSchema = z.object({
  seq: z.number().int().min(1, 'seq starts at 1').max(2_000_000_000),
  frequencyHz: finite.refine((value) => value > 0, 'must be above zero'),
  vinV: finite.refine((value) => value > 0, 'must be above zero'),
  voutV: finite.refine((value) => value >= 0, 'must not be negative'),
  phaseDeg: finite.nullable().optional(),
  floorV: finite.refine((value) => value >= 0, 'must not be negative').nullable().optional(),
});
export type StreamPoint = z.infer<typeof streamPointSchema>;

export const clientMessageSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('open-sweep'),
    sessionId: z.string().min(1),
    mode: sweepModeSchema,
    /** Chosen by the client, unique per session: reopening with the same key resumes the sweep. */
    key: z.string().min(1).max(120),
    amplitudeConvention: z.enum(['peak', 'rms']).default('rms'),
    sourceName: z.string().max(200).default(''),
  }),
  z.object({
    type: z.literal('points'),
    sweepId: z.string().min(1),
    points: z.array(streamPointSchema).min(1).max(maximumPointsPerMessage),
  }),
  z.object({ type: z.literal('close-sweep'), sweepId: z.string().min(1) }),
  z.object({ type: z.literal('subscribe'), sessionId: z.string().min(1) }),
  z.object({ type: z.literal('unsubscribe'), sessionId: z.string().min(1) }),
]);
export type ClientMessage = z.input<typeof clientMessageSchema>;

export type ServerMessage =
  | { type: 'ready'; user: { name: string; role: string } }
  | { type: 'sweep-opened'; sweepId: string; sessionId: string; mode: 'differential' | 'common-mode'; acknowledgedThrough: number }
  | { type: 'ack'; sweepId: string; through: number }
  | { type: 'sweep-closed'; sweepId: string; pointCount: number }
  | { type: 'subscribed'; sessionId: string }
  | {
      type: 'session-points';
      sessionId: string;
      sweepId: string;
      mode: 'differential' | 'common-mode';
      points: { seq: number; frequencyHz: number; vinV: number; voutV: number; phaseDeg: number | null; floorV: number | null }[];
    }
  | { type: 'session-changed'; sessionId: string; reason: 'sweep-added' | 'sweep-deleted' | 'sweep-closed' | 'archived' }
  /** The engine's refit of the session, sent to viewers at most every 250 ms while points arrive. */
  | { type: 'session-analysis'; sessionId: string; analysis: SessionAnalysis }
  | { type: 'error'; message: string };

/** WebSocket close codes used by the server. */
export const streamCloseCodes = {
  policyViolation: 1008,
  messageTooBig: 1009,
  unauthorized: 4401,
  forbidden: 4403,
  notFound: 4404,
  badMessage: 4400,
} as const;
