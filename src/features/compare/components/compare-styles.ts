// How each session of a comparison is drawn (docs/CHARTS.md "Compare"): its own colour and marker
// shape, so sessions separate without colour; bounds stay open upward triangles in the session's colour.
import type { MarkerShape } from '../../../lib/charts/uplot-markers';

export type { MarkerShape };

export interface SessionStyle {
  colour: string;
  marker: MarkerShape;
  filled: boolean;
  dash?: number[];
}

// Okabe–Ito families in the app's own shades, darkest first so the reference reads strongest in grey.
const colours = ['#1d5fa0', '#e08e0b', '#007a5e', '#a63e08', '#5aa3d6', '#16242e', '#b0559a', '#8a6d00'];
const markers: MarkerShape[] = ['circle', 'square', 'diamond', 'triangle-down'];
const dashes: (number[] | undefined)[] = [undefined, [6, 3], [2, 2], [10, 3]];

/** The style of the session at `position` in the comparison (0 = the reference); repeats after 8 with open markers. */
export function sessionStyle(position: number): SessionStyle {
  const index = ((position % 16) + 16) % 16;
  return {
    colour: colours[index % colours.length],
    marker: markers[index % markers.length],
    filled: index < colours.length,
    dash: dashes[Math.floor(index / 2) % dashes.length],
  };
}
