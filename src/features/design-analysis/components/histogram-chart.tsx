import { memo, useEffect, useMemo, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { MonteCarloAtFrequencyResult } from '../../../../shared/analysis/prediction-band';
import { formatDb } from '../../../lib/charts/log-frequency-axis';
import { chartColours, drawVerticalMarker } from './chart-style';
import { histogramBars, type HistogramBars } from './histogram-data';

const numberFont = '12px "JetBrains Mono", ui-monospace, monospace';
const labelFont = '14px "IBM Plex Sans", system-ui, sans-serif';

/**
 * The Monte Carlo histogram of CMRR at one frequency (uPlot bars): bins at or above the limit in
 * sky blue, below it in hatched vermilion, with the limit and the worst case marked by lines.
 */
function HistogramChart({ result }: { result: MonteCarloAtFrequencyResult }) {
  const container = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const current = useRef<{ bars: HistogramBars; result: MonteCarloAtFrequencyResult } | null>(null);
  const [cursorIndex, setCursorIndex] = useState<number | null>(null);
  const limitDb = result.limitDb ?? null;
  const bars = useMemo(() => histogramBars(result.histogram, limitDb, result.worstCaseDb), [result, limitDb]);

  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const hatch = hatchPattern();
    const options: uPlot.Options = {
      width: Math.max(300, element.clientWidth),
      height: 260,
      padding: [14, 30, 0, 4],
      scales: {
        x: { time: false, range: () => current.current?.bars.rangeDb ?? [0, 1] },
        y: { range: (_u, _min, max) => [0, Math.max(1, max) * 1.08] },
      },
      axes: [
        { label: 'CMRR (dB)', labelFont, font: numberFont, stroke: chartColours.axis, grid: { stroke: chartColours.gridMinor, width: 1 }, ticks: { stroke: chartColours.gridMajor, width: 1, size: 5 } },
        { label: 'Trials', labelFont, font: numberFont, stroke: chartColours.axis, size: 64, grid: { stroke: chartColours.gridMinor, width: 1 }, ticks: { stroke: chartColours.gridMajor, width: 1, size: 5 } },
      ],
      legend: { show: false },
      cursor: { drag: { x: false, y: false }, points: { show: false } },
      series: [
        { label: 'CMRR' },
        { label: 'At or above the limit', stroke: chartColours.sky, fill: 'rgba(90, 163, 214, 0.55)', width: 1, paths: uPlot.paths.bars!({ size: [1, 200], gap: 1 }), points: { show: false } },
        { label: 'Below the limit', stroke: chartColours.failing, fill: hatch ?? 'rgba(166, 62, 8, 0.35)', width: 1, paths: uPlot.paths.bars!({ size: [1, 200], gap: 1 }), points: { show: false } },
      ],
      hooks: {
        setCursor: [(u) => setCursorIndex(u.cursor.idx ?? null)],
        draw: [
          (u) => {
            const shown = current.current;
            if (!shown) return;
            if (shown.result.limitDb !== undefined) drawVerticalMarker(u, shown.result.limitDb, { colour: chartColours.limit, dash: [8, 3, 2, 3], width: 2, label: `limit ${formatDb(shown.result.limitDb)}` });
            if (Number.isFinite(shown.result.worstCaseDb)) drawVerticalMarker(u, shown.result.worstCaseDb, { colour: chartColours.worstCase, dash: [2, 2], width: 1.5, label: `worst case ${formatDb(shown.result.worstCaseDb)}`, labelSide: 'right', labelRow: 1 });
          },
        ],
      },
    };
    const created = new uPlot(options, [[], [], []], element);
    plot.current = created;
    const resize = new ResizeObserver(() => created.setSize({ width: Math.max(300, element.clientWidth), height: 260 }));
    resize.observe(element);
    return () => {
      resize.disconnect();
      created.destroy();
      plot.current = null;
    };
  }, []);

  useEffect(() => {
    current.current = { bars, result };
    plot.current?.setData([bars.centresDb, bars.passingCounts, bars.failingCounts] as unknown as uPlot.AlignedData);
  }, [bars, result]);

  const index = cursorIndex !== null && cursorIndex < bars.centresDb.length ? cursorIndex : null;
  const count = index === null ? null : (bars.passingCounts[index] ?? bars.failingCounts[index] ?? 0);
  const half = bars.stepDb / 2;
  return (
    <div>
      <div ref={container} className="w-full" role="img" aria-label={`Histogram of CMRR over ${result.trials.toLocaleString('en-GB')} Monte Carlo trials, with the limit and the worst case marked`} />
      <p className="mt-2 min-h-[2.25rem] rounded-md bg-ink-50 px-3 py-2 text-[0.875rem] text-ink-800">
        {index !== null && count !== null ? (
          <>
            <span className="tabular">{formatDb(bars.centresDb[index] - half, { digits: 2 })}</span> … <span className="tabular">{formatDb(bars.centresDb[index] + half, { digits: 2 })}</span>:{' '}
            <span className="tabular">{count.toLocaleString('en-GB')}</span> trials (<span className="tabular">{((100 * count) / result.trials).toFixed(2)} %</span>)
            {bars.failingCounts[index] !== null && <span className="text-fault-700"> — below the limit</span>}
          </>
        ) : (
          <span className="text-ink-600">
            Point at a bar for its trials. <span className="tabular">{result.histogram.belowCount.toLocaleString('en-GB')}</span> trials lie below the drawn range and{' '}
            <span className="tabular">{result.histogram.aboveCount.toLocaleString('en-GB')}</span> above it (0.5 % tails).
          </span>
        )}
      </p>
    </div>
  );
}

// Redrawn only when a new result arrives, not on every progress update of the page.
export default memo(HistogramChart);

/** Diagonal vermilion hatching for bins below the limit (distinct from the blue bars in grey print too). */
function hatchPattern(): CanvasPattern | null {
  const tile = document.createElement('canvas');
  const size = Math.round(6 * uPlot.pxRatio);
  tile.width = size;
  tile.height = size;
  const ctx = tile.getContext('2d');
  if (!ctx) return null;
  ctx.fillStyle = 'rgba(166, 62, 8, 0.18)';
  ctx.fillRect(0, 0, size, size);
  ctx.strokeStyle = 'rgba(166, 62, 8, 0.8)';
  ctx.lineWidth = Math.max(1, uPlot.pxRatio);
  ctx.beginPath();
  ctx.moveTo(0, size);
  ctx.lineTo(size, 0);
  ctx.stroke();
  return ctx.createPattern(tile, 'repeat');
}
