// How each series of the session charts is drawn (docs/CHARTS.md "Series"): colour, line and
// marker by role, with the few per-series exceptions the page names (|Ad| squares, |Acm| bounds
// pointing down). Pure data, so the chart chunk and the tests read the same table.
import type { SeriesRole } from '../../../lib/charts/session-chart-data';
import type { MarkerShape } from '../../../lib/charts/uplot-markers';

export type { MarkerShape };

export interface SeriesStyle {
  colour: string;
  /** Line width in CSS pixels; 0 draws no line (markers only, or a band edge). */
  lineWidth: number;
  dash?: number[];
  marker?: { shape: MarkerShape; sizePx: number; filled: boolean };
  /** Join across nulls (curves on their own grids share the merged frequency grid). */
  spanGaps: boolean;
}

export const chartColours = {
  trace: '#1d5fa0',
  fault: '#a63e08',
  faultDark: '#8a3307',
  ink: '#4a6275',
  amber: '#e08e0b',
  amberLight: '#f2b544',
  sky: '#5aa3d6',
  grid: '#e8edf0',
  gridDecade: '#d5dde3',
  axis: '#33495a',
} as const;

/** Band fills (drawn behind the lines): the op-amp-sign band at 20 %, the Monte Carlo band at 15 %. */
export const bandFills = {
  'op-amp-sign-band': 'rgba(242, 181, 68, 0.2)',
  'monte-carlo-band': 'rgba(90, 163, 214, 0.15)',
} as const;

const byRole: Record<SeriesRole, SeriesStyle> = {
  'measured-value': { colour: chartColours.trace, lineWidth: 1.5, marker: { shape: 'circle', sizePx: 5, filled: true }, spanGaps: true },
  'measured-bound': { colour: chartColours.trace, lineWidth: 0, marker: { shape: 'triangle-up', sizePx: 8, filled: false }, spanGaps: false },
  'measured-failing': { colour: chartColours.fault, lineWidth: 0, marker: { shape: 'ring', sizePx: 9, filled: false }, spanGaps: false },
  fit: { colour: chartColours.ink, lineWidth: 1, spanGaps: true },
  prediction: { colour: chartColours.amber, lineWidth: 1.5, dash: [6, 4], spanGaps: true },
  'prediction-band-edge': { colour: chartColours.amberLight, lineWidth: 0, spanGaps: true },
  'monte-carlo-median': { colour: chartColours.sky, lineWidth: 1.5, dash: [1, 3], spanGaps: true },
  'monte-carlo-band-edge': { colour: chartColours.sky, lineWidth: 0.5, spanGaps: true },
  limit: { colour: chartColours.faultDark, lineWidth: 2, dash: [8, 3, 2, 3], spanGaps: true },
  'limit-guard': { colour: chartColours.faultDark, lineWidth: 1, dash: [1, 2], spanGaps: true },
};

/** The style of one series: its role's, with the gain chart's marker exceptions. */
export function seriesStyle(key: string, role: SeriesRole): SeriesStyle {
  const style = byRole[role];
  if (key === 'ad-measured' && style.marker) return { ...style, marker: { ...style.marker, shape: 'square' } };
  if (key === 'acm-bound' && style.marker) return { ...style, marker: { ...style.marker, shape: 'triangle-down' } };
  return style;
}
