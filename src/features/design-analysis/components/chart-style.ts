// How the design view's charts draw each series role (docs/CHARTS.md): colour, line, marker,
// band fill, and the logarithmic frequency axis. uPlot options only; the data come prepared.
import uPlot from 'uplot';
import type { SeriesRole } from '../../../lib/charts/session-chart-data';
import { logFrequencyTicks } from '../../../lib/charts/log-frequency-axis';

export const chartColours = {
  measured: '#1d5fa0',
  fit: '#4a6275',
  prediction: '#e08e0b',
  predictionBand: 'rgba(242, 181, 68, 0.20)',
  sky: '#5aa3d6',
  monteCarloBand: 'rgba(90, 163, 214, 0.15)',
  limit: '#8a3307',
  worstCase: '#16242e',
  failing: '#a63e08',
  gridMajor: '#d5dde3',
  gridMinor: '#e8edf0',
  axis: '#4a6275',
  chosen: '#33495a',
} as const;

const numberFont = '12px "JetBrains Mono", ui-monospace, monospace';
const labelFont = '14px "IBM Plex Sans", system-ui, sans-serif';

/** The roles of the design view: the session roles plus the corner worst case. */
export type DesignSeriesRole = SeriesRole | 'worst-case';

/** A uPlot series for a role (docs/CHARTS.md, "Series"). */
export function seriesForRole(role: DesignSeriesRole, label: string): uPlot.Series {
  const base: uPlot.Series = { label, spanGaps: true, points: { show: false } };
  switch (role) {
    case 'prediction':
      return { ...base, stroke: chartColours.prediction, width: 1.5, dash: [6, 4] };
    case 'prediction-band-edge':
      return { ...base, stroke: 'rgba(0,0,0,0)', width: 0 };
    case 'monte-carlo-median':
      return { ...base, stroke: chartColours.sky, width: 1.5, dash: [1, 3] };
    case 'monte-carlo-band-edge':
      return { ...base, stroke: chartColours.sky, width: 0.5 };
    case 'limit':
      return { ...base, stroke: chartColours.limit, width: 2, dash: [8, 3, 2, 3] };
    case 'limit-guard':
      return { ...base, stroke: chartColours.limit, width: 1, dash: [1, 2] };
    case 'worst-case':
      return { ...base, stroke: chartColours.worstCase, width: 1, dash: [2, 2] };
    case 'fit':
      return { ...base, stroke: chartColours.fit, width: 1 };
    default:
      return { ...base, stroke: chartColours.measured, width: 1.5 };
  }
}

export function bandFill(role: 'op-amp-sign-band' | 'monte-carlo-band'): string {
  return role === 'monte-carlo-band' ? chartColours.monteCarloBand : chartColours.predictionBand;
}

/** x axis on log frequency: ticks and labels from logFrequencyTicks (1-2-5 labelled within 4 decades). */
export function logFrequencyAxis(): uPlot.Axis {
  return {
    label: 'Frequency',
    labelFont,
    font: numberFont,
    stroke: chartColours.axis,
    splits: (u) => {
      const min = u.scales.x.min ?? 1;
      const max = u.scales.x.max ?? 10;
      return max > min && min > 0 ? logFrequencyTicks(min, max).map((tick) => tick.valueHz) : [];
    },
    values: (u, splits) => {
      const min = u.scales.x.min ?? 1;
      const max = u.scales.x.max ?? 10;
      if (!(max > min && min > 0)) return splits.map(() => '');
      const labels = new Map(logFrequencyTicks(min, max).map((tick) => [tick.valueHz, tick.label]));
      return splits.map((value) => labels.get(value) ?? '');
    },
    grid: { stroke: (u, axisIndex) => (axisIndex === 0 ? chartColours.gridMinor : chartColours.gridMinor), width: 1 },
    ticks: { stroke: chartColours.gridMajor, width: 1, size: 5 },
  };
}

/** y axis in dB with its unit. */
export function decibelAxis(label = 'CMRR'): uPlot.Axis {
  return {
    label: `${label} (dB)`,
    labelFont,
    font: numberFont,
    stroke: chartColours.axis,
    size: 56,
    values: (_u, splits) => splits.map((value) => `${value}`),
    grid: { stroke: chartColours.gridMinor, width: 1 },
    ticks: { stroke: chartColours.gridMajor, width: 1, size: 5 },
  };
}

/** A vertical line across the plot at x (canvas drawing for a draw hook), with a small label at its top. */
export function drawVerticalMarker(u: uPlot, value: number, options: { colour: string; dash?: number[]; width?: number; label?: string; labelSide?: 'left' | 'right'; labelRow?: number }): void {
  const x = u.valToPos(value, 'x', true);
  const { left, top, width, height } = u.bbox;
  if (!(x >= left && x <= left + width)) return;
  const ctx = u.ctx;
  const ratio = uPlot.pxRatio;
  ctx.save();
  ctx.strokeStyle = options.colour;
  ctx.lineWidth = (options.width ?? 1) * ratio;
  ctx.setLineDash((options.dash ?? []).map((part) => part * ratio));
  ctx.beginPath();
  ctx.moveTo(x, top);
  ctx.lineTo(x, top + height);
  ctx.stroke();
  if (options.label) {
    ctx.setLineDash([]);
    ctx.fillStyle = options.colour;
    ctx.font = `${11 * ratio}px "JetBrains Mono", ui-monospace, monospace`;
    ctx.textBaseline = 'top';
    const textWidth = ctx.measureText(options.label).width;
    const side = options.labelSide ?? (x + textWidth + 6 * ratio > left + width ? 'left' : 'right');
    ctx.textAlign = side === 'right' ? 'left' : 'right';
    const textX = side === 'right' ? x + 4 * ratio : x - 4 * ratio;
    const rowTop = top + (2 + 16 * (options.labelRow ?? 0)) * ratio;
    ctx.fillStyle = 'rgba(255,255,255,0.85)';
    ctx.fillRect(side === 'right' ? textX - 2 * ratio : textX - textWidth - 2 * ratio, rowTop, textWidth + 4 * ratio, 14 * ratio);
    ctx.fillStyle = options.colour;
    ctx.fillText(options.label, textX, rowTop + ratio);
  }
  ctx.restore();
}
