// The compare view's overlay (its own download, with uPlot): each session's CMRR in its colour and
// marker, bounds as open upward triangles, the chosen frequency as a vertical line; a click picks
// the frequency, a drag zooms, a double-click shows all.
import { useEffect, useLayoutEffect, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { formatDb, formatFrequencyHz, logFrequencyTicks } from '../../../lib/charts/log-frequency-axis';
import type { ComparisonChart } from './compare-chart-data';
import { sessionStyle } from './compare-styles';
import { markerPaths } from '../../../lib/charts/uplot-markers';

const axisFont = '12px "JetBrains Mono", monospace';
const labelFont = '14px "IBM Plex Sans", sans-serif';
const grid = { stroke: '#e8edf0', width: 1 };

function toData(chart: ComparisonChart): uPlot.AlignedData {
  return [chart.frequencyHz, ...chart.sessions.flatMap((session) => [session.valuesDb, session.boundsDb])] as uPlot.AlignedData;
}

export default function CompareChart({ chart, frequencyHz, onPick }: { chart: ComparisonChart; frequencyHz: number; onPick: (frequencyHz: number) => void }) {
  const container = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const latest = useRef({ chart, frequencyHz, onPick });
  const [hover, setHover] = useState<number | null>(null);
  useLayoutEffect(() => {
    latest.current = { chart, frequencyHz, onPick };
  });

  // The session list fixes the series, so a new list builds a new chart; a new frequency only redraws.
  const shape = chart.sessions.map((session) => session.sessionId).join(',');
  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const current = latest.current.chart;
    const series: uPlot.Series[] = [{}];
    current.sessions.forEach((session, position) => {
      const style = sessionStyle(position);
      series.push({
        label: session.label,
        stroke: style.colour,
        width: 1.5,
        dash: style.dash,
        spanGaps: true,
        points: { show: true, paths: markerPaths(style.marker, 6, style.filled), stroke: style.colour, fill: style.filled ? style.colour : 'rgba(0,0,0,0)', width: 1.25 },
      });
      series.push({
        label: `${session.label}, lower bound`,
        stroke: style.colour,
        paths: () => null,
        points: { show: true, paths: markerPaths('triangle-up', 8, false), stroke: style.colour, fill: 'rgba(0,0,0,0)', width: 1.25 },
      });
    });
    let tickCache: { key: string; labels: Map<number, string> } | null = null;
    const ticks = (min: number, max: number) => {
      const key = `${min}:${max}`;
      if (!tickCache || tickCache.key !== key) tickCache = { key, labels: new Map(min > 0 && max > min ? logFrequencyTicks(min, max).map((tick) => [tick.valueHz, tick.label]) : []) };
      return tickCache.labels;
    };
    const created = new uPlot(
      {
        width: Math.max(320, element.clientWidth),
        height: 360,
        padding: [10, 30, 0, 4],
        legend: { show: false },
        scales: { x: { time: false, distr: 3, log: 10 }, y: { auto: true, range: (_u, min, max) => latest.current.chart.yRangeDb ?? [min - 3, max + 3] } },
        axes: [
          {
            label: 'Frequency',
            labelFont,
            font: axisFont,
            grid,
            splits: (u) => [...ticks(u.scales.x.min ?? 1, u.scales.x.max ?? 10).keys()],
            values: (u, splits) => splits.map((value) => ticks(u.scales.x.min ?? 1, u.scales.x.max ?? 10).get(value) ?? ''),
          },
          { label: 'CMRR (dB)', labelFont, font: axisFont, grid, size: 56 },
        ],
        series,
        cursor: { drag: { x: true, y: false, setScale: true } },
        hooks: {
          setCursor: [(u) => setHover(u.cursor.left !== undefined && u.cursor.left >= 0 ? u.posToVal(u.cursor.left, 'x') : null)],
          draw: [
            (u) => {
              const x = Math.round(u.valToPos(latest.current.frequencyHz, 'x', true));
              const { top, height, left, width } = u.bbox;
              if (x < left || x > left + width) return;
              u.ctx.save();
              u.ctx.strokeStyle = '#16242e';
              u.ctx.lineWidth = 1.5 * uPlot.pxRatio;
              u.ctx.setLineDash([4 * uPlot.pxRatio, 3 * uPlot.pxRatio]);
              u.ctx.beginPath();
              u.ctx.moveTo(x, top);
              u.ctx.lineTo(x, top + height);
              u.ctx.stroke();
              u.ctx.restore();
            },
          ],
        },
      },
      toData(current),
      element,
    );
    plot.current = created;
    // uPlot swallows the click that ends a drag-zoom, so a plain click here is a pick.
    const pick = () => {
      const left = created.cursor.left ?? -1;
      if (left >= 0) latest.current.onPick(created.posToVal(left, 'x'));
    };
    created.over.addEventListener('click', pick);
    const observer = new ResizeObserver(() => {
      const width = Math.max(320, element.clientWidth);
      if (Math.abs(width - created.width) > 1) created.setSize({ width, height: 360 });
    });
    observer.observe(element);
    return () => {
      observer.disconnect();
      created.over.removeEventListener('click', pick);
      created.destroy();
      plot.current = null;
    };
  }, [shape]);

  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    const data = toData(chart);
    if (u.data[0] !== data[0] || u.data.length !== data.length || u.data.some((column, index) => column !== data[index])) u.setData(data);
  }, [chart]);
  useEffect(() => {
    plot.current?.redraw(false, false);
  }, [frequencyHz]);

  return (
    <div className="space-y-1">
      <div ref={container} className="w-full cursor-crosshair" role="img" aria-label="CMRR of each chosen session against frequency on a logarithmic axis; the dashed vertical line marks the comparison frequency" />
      <p className="min-h-[1.5rem] text-[0.875rem] text-ink-600">
        {hover !== null ? (
          <>
            Click to compare at <span className="tabular">{formatFrequencyHz(hover)}</span>; drag across to zoom, double-click to show all.
          </>
        ) : (
          <>
            Comparing at <span className="tabular">{formatFrequencyHz(frequencyHz)}</span> (dashed line). Click the chart to choose another frequency. Range{' '}
            <span className="tabular">{chart.yRangeDb ? `${formatDb(chart.yRangeDb[0], { digits: 0 })} to ${formatDb(chart.yRangeDb[1], { digits: 0 })}` : '—'}</span>.
          </>
        )}
      </p>
    </div>
  );
}
