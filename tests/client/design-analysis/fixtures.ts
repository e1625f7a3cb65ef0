// Circuits and masks of the demo's boards (invented values, from server/demo/fictional-boards.ts).
import { bridgeFrontEndCircuit, bridgeFrontEndMask } from '../../../server/demo/fictional-boards';
import type { Circuit } from '../../../shared/schemas/designs';

export { currentSenseCircuit } from '../../../server/demo/fictional-boards';
export const bridgeMask = bridgeFrontEndMask;

/** The bridge front-end HRB-204 with all four resistors at `tolerance` (a fraction). */
export function bridgeCircuit(tolerance = 0.001): Circuit {
  return bridgeFrontEndCircuit({ tolerance });
}
