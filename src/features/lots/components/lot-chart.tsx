import { useEffect, useMemo, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { formatDb, formatFrequencyHz, logFrequencyTicks } from '../../../lib/charts/log-frequency-axis';
import { lotReadout, type LotChart as LotChartData } from './lot-chart-data';

// docs/CHARTS.md: measured in trace blue with markers, the Monte Carlo band in sky, the limit dash-dot vermilion.
const colours = {
  measured: 'rgba(29, 95, 160, 0.75)',
  measuredSolid: '#1d5fa0',
  focused: '#123c66',
  sky: '#5aa3d6',
  band: 'rgba(90, 163, 214, 0.18)',
  limit: '#8a3307',
  failing: '#a63e08',
  outlier: '#16242e',
  grid: '#e8edf0',
  tick: '#d5dde3',
  axis: '#4a6275',
};
const numberFont = '12px "JetBrains Mono", ui-monospace, monospace';
const labelFont = '14px "IBM Plex Sans", system-ui, sans-serif';

/**
 * All units of a lot overlaid on log frequency (uPlot): each unit's values joined, its lower bounds
 * as open up-triangles, failing points ringed, outliers in open diamonds, over the predicted
 * Monte Carlo band and under the limit. Pointing at a curve brings that unit forward. Loaded with its own chunk.
 */
export default function LotChart({ chart }: { chart: LotChartData }) {
  const container = useRef<HTMLDivElement>(null);
  const [cursorIndex, setCursorIndex] = useState<number | null>(null);
  const [focusedUnit, setFocusedUnit] = useState<string | null>(null);

  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const unitCount = chart.units.length;
    const bandStart = unitCount + 1;
    const series: uPlot.Series[] = [
      { label: 'Frequency' },
      ...chart.units.map((unit) => ({ label: unit.unitSerial, stroke: colours.measured, width: 1.25, spanGaps: true, points: { show: true, size: 4, space: 0, fill: colours.measuredSolid, stroke: colours.measuredSolid } })),
    ];
    const data: (number | null)[][] = [chart.frequencyHz, ...chart.units.map((unit) => unit.values)];
    const bands: uPlot.Band[] = [];
    if (chart.band) {
      series.push(
        { label: 'Predicted 5th percentile', stroke: colours.sky, width: 0.5, spanGaps: true, points: { show: false } },
        { label: 'Predicted median', stroke: colours.sky, width: 1.5, dash: [1, 3], spanGaps: true, points: { show: false } },
        { label: 'Predicted 95th percentile', stroke: colours.sky, width: 0.5, spanGaps: true, points: { show: false } },
      );
      data.push(chart.band.p05, chart.band.p50, chart.band.p95);
      bands.push({ series: [bandStart + 2, bandStart], fill: colours.band });
    }
    series.push({ label: 'Limit', stroke: colours.limit, width: 2, dash: [8, 3, 2, 3], spanGaps: true, points: { show: false } });
    data.push(chart.limit);
    if (chart.limitGuard) {
      series.push({ label: 'Limit + guard band', stroke: colours.limit, width: 1, dash: [1, 2], spanGaps: true, points: { show: false } });
      data.push(chart.limitGuard);
    }

    const options: uPlot.Options = {
      width: Math.max(320, element.clientWidth),
      height: 380,
      padding: [14, 30, 0, 4],
      scales: { x: { time: false, distr: 3, log: 10 }, y: chart.yRangeDb ? { range: () => chart.yRangeDb as [number, number] } : { auto: true } },
      axes: [
        {
          label: 'Frequency',
          labelFont,
          font: numberFont,
          stroke: colours.axis,
          splits: (u) => ticks(u).map((tick) => tick.valueHz),
          values: (u, splits) => {
            const labels = new Map(ticks(u).map((tick) => [tick.valueHz, tick.label]));
            return splits.map((value) => labels.get(value) ?? '');
          },
          grid: { stroke: colours.grid, width: 1 },
          ticks: { stroke: colours.tick, width: 1, size: 5 },
        },
        { label: 'CMRR (dB)', labelFont, font: numberFont, stroke: colours.axis, size: 56, grid: { stroke: colours.grid, width: 1 }, ticks: { stroke: colours.tick, width: 1, size: 5 } },
      ],
      legend: { show: false },
      focus: { alpha: 0.35 },
      cursor: { drag: { x: false, y: false }, points: { show: false }, focus: { prox: 12 } },
      series,
      bands,
      hooks: {
        setCursor: [(u) => setCursorIndex(u.cursor.idx ?? null)],
        setSeries: [
          (_u, seriesIndex) => {
            setFocusedUnit(seriesIndex !== null && seriesIndex >= 1 && seriesIndex <= unitCount ? chart.units[seriesIndex - 1].unitSerial : null);
          },
        ],
        draw: [(u) => drawMarkers(u, chart)],
      },
    };
    const created = new uPlot(options, data as unknown as uPlot.AlignedData, element);
    const resize = new ResizeObserver(() => created.setSize({ width: Math.max(320, element.clientWidth), height: 380 }));
    resize.observe(element);
    return () => {
      resize.disconnect();
      created.destroy();
    };
  }, [chart]);

  const readout = useMemo(() => (cursorIndex !== null && cursorIndex < chart.frequencyHz.length ? lotReadout(chart, cursorIndex) : null), [chart, cursorIndex]);

  return (
    <div>
      <div ref={container} className="w-full" role="img" aria-label={`CMRR of ${chart.units.length} units against frequency over the predicted Monte Carlo band, with the limit mask`} />
      <ChartKey hasBand={chart.band !== null} />
      <div className="mt-2 min-h-[4.5rem] rounded-md bg-ink-50 px-3 py-2 text-[0.875rem] text-ink-800" data-testid="lot-readout">
        {readout && readout.entries.length + (readout.band ? 1 : 0) > 0 ? (
          <>
            <p className="flex flex-wrap gap-x-4">
              <span className="tabular font-semibold">{formatFrequencyHz(readout.frequencyHz)}</span>
              {readout.limitDb !== null && (
                <span>
                  Limit <span className="tabular">{formatDb(readout.limitDb)}</span>
                </span>
              )}
              {readout.band && (
                <span>
                  Predicted 5–95 % <span className="tabular">{formatDb(readout.band.p05)}</span> … <span className="tabular">{formatDb(readout.band.p95)}</span>
                </span>
              )}
            </p>
            <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-0.5">
              {readout.entries.map((entry) => (
                <li key={entry.unitSerial} className={entry.unitSerial === focusedUnit ? 'font-semibold text-ink-950' : ''}>
                  {entry.unitSerial} <span className="tabular">{formatDb(entry.cmrrDb, { lowerBound: entry.lowerBound })}</span>
                  {entry.failing && <span className="text-fault-700"> ◯ fails</span>}
                  {entry.outlier && (
                    <span>
                      {' '}
                      ◇ outlier ({entry.outlier.direction}, z <span className="tabular">{entry.outlier.modifiedZ.toFixed(1)}</span>)
                    </span>
                  )}
                </li>
              ))}
            </ul>
          </>
        ) : (
          <p className="text-ink-600">Point at the chart to read every unit at one frequency; the nearest curve comes forward.</p>
        )}
      </div>
    </div>
  );
}

function ticks(u: uPlot) {
  const min = u.scales.x.min ?? 1;
  const max = u.scales.x.max ?? 10;
  return max > min && min > 0 ? logFrequencyTicks(min, max) : [];
}

/** Bounds, failing rings and outlier diamonds, drawn over the lines (markers do not fit uPlot's one-line-per-series model). */
function drawMarkers(u: uPlot, chart: LotChartData): void {
  const ctx = u.ctx;
  const ratio = uPlot.pxRatio;
  const x = (index: number) => u.valToPos(chart.frequencyHz[index], 'x', true);
  const y = (value: number) => u.valToPos(value, 'y', true);
  ctx.save();
  chart.units.forEach((unit, unitIndex) => {
    if (u.series[unitIndex + 1]?.show === false) return;
    ctx.strokeStyle = colours.measuredSolid;
    ctx.lineWidth = 1.25 * ratio;
    const half = 4.5 * ratio;
    unit.bounds.forEach((value, index) => {
      if (value === null) return;
      const cx = x(index);
      const cy = y(value);
      ctx.beginPath();
      ctx.moveTo(cx, cy - half);
      ctx.lineTo(cx + half, cy + half * 0.8);
      ctx.lineTo(cx - half, cy + half * 0.8);
      ctx.closePath();
      ctx.fillStyle = '#ffffff';
      ctx.fill();
      ctx.stroke();
    });
    ctx.strokeStyle = colours.failing;
    ctx.lineWidth = 1.5 * ratio;
    for (const index of unit.failingIndices) {
      const value = unit.values[index] ?? unit.bounds[index];
      if (value === null) continue;
      ctx.beginPath();
      ctx.arc(x(index), y(value), 4.5 * ratio, 0, 2 * Math.PI);
      ctx.stroke();
    }
  });
  ctx.strokeStyle = colours.outlier;
  ctx.lineWidth = 1.5 * ratio;
  for (const mark of chart.outliers) {
    const cx = x(mark.index);
    const cy = y(mark.cmrrDb);
    const size = 7 * ratio;
    ctx.beginPath();
    ctx.moveTo(cx, cy - size);
    ctx.lineTo(cx + size, cy);
    ctx.lineTo(cx, cy + size);
    ctx.lineTo(cx - size, cy);
    ctx.closePath();
    ctx.stroke();
  }
  ctx.restore();
}

/** The chart's key: each mark drawn as on the chart, in words. */
function ChartKey({ hasBand }: { hasBand: boolean }) {
  return (
    <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-[0.875rem] text-ink-700" aria-label="Chart key">
      <li className="inline-flex items-center gap-1.5">
        <svg viewBox="0 0 28 12" className="h-3 w-7" aria-hidden="true">
          <line x1="0" y1="6" x2="28" y2="6" stroke={colours.measuredSolid} strokeWidth="1.25" />
          <circle cx="14" cy="6" r="2.5" fill={colours.measuredSolid} />
        </svg>
        unit, measured
      </li>
      <li className="inline-flex items-center gap-1.5">
        <svg viewBox="0 0 12 12" className="h-3 w-3" aria-hidden="true">
          <path d="M6 1.5 10.5 10H1.5Z" fill="#fff" stroke={colours.measuredSolid} strokeWidth="1.25" />
        </svg>
        lower bound (at the noise floor)
      </li>
      <li className="inline-flex items-center gap-1.5">
        <svg viewBox="0 0 12 12" className="h-3 w-3" aria-hidden="true">
          <circle cx="6" cy="6" r="4.5" fill="none" stroke={colours.failing} strokeWidth="1.5" />
        </svg>
        fails the limit
      </li>
      <li className="inline-flex items-center gap-1.5">
        <svg viewBox="0 0 16 16" className="h-3.5 w-3.5" aria-hidden="true">
          <path d="M8 1 15 8 8 15 1 8Z" fill="none" stroke={colours.outlier} strokeWidth="1.5" />
        </svg>
        outlier (modified z beyond 3.5)
      </li>
      {hasBand && (
        <li className="inline-flex items-center gap-1.5">
          <svg viewBox="0 0 28 12" className="h-3 w-7" aria-hidden="true">
            <rect x="0" y="1" width="28" height="10" fill="rgba(90,163,214,0.35)" />
            <line x1="0" y1="6" x2="28" y2="6" stroke={colours.sky} strokeWidth="1.5" strokeDasharray="1 3" />
          </svg>
          predicted Monte Carlo 5–95 % and median
        </li>
      )}
      <li className="inline-flex items-center gap-1.5">
        <svg viewBox="0 0 28 12" className="h-3 w-7" aria-hidden="true">
          <line x1="0" y1="6" x2="28" y2="6" stroke={colours.limit} strokeWidth="2" strokeDasharray="8 3 2 3" />
        </svg>
        limit
      </li>
    </ul>
  );
}
