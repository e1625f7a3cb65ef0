import { useEffect, useLayoutEffect, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { logFrequencyTicks } from '../../../lib/charts/log-frequency-axis';
import { chartColours, seriesStyle, type SeriesStyle } from './chart-styles';
import { readoutAt, type FixedChartData, type FixedSeries, type TraceGroup } from './chart-series';
import { markerPaths } from '../../../lib/charts/uplot-markers';

export interface ChartBandFill {
  lowerKey: string;
  upperKey: string;
  fill: string;
}

export interface LogFrequencyChartProps {
  title: string;
  /** What the chart shows, for screen readers (the numbers are in the tables beside it). */
  description: string;
  fixed: readonly FixedSeries[];
  chart: FixedChartData;
  /** Increases with every new data set; reported back through onDrawn once drawn. */
  version: number;
  yRangeDb: [number, number] | null;
  yLabel: string;
  height: number;
  bands?: readonly ChartBandFill[];
  hidden: ReadonlySet<TraceGroup>;
  syncKey: string;
  styleFor?: (entry: FixedSeries) => SeriesStyle;
  onDrawn?: (version: number) => void;
  /** Shown over the plot while it waits for its first data (the frame is laid out meanwhile). */
  placeholder?: string;
}

const axisFont = '12px "JetBrains Mono", monospace';
const labelFont = '14px "IBM Plex Sans", sans-serif';

/** Frequency axis of log graph paper: 1-2-5 labels with SI prefixes (logFrequencyTicks). */
function frequencyAxis(): uPlot.Axis {
  let cache: { key: string; labels: Map<number, string> } | null = null;
  const ticks = (min: number, max: number) => {
    const key = `${min}:${max}`;
    if (!cache || cache.key !== key) {
      const list = min > 0 && max > min ? logFrequencyTicks(min, max) : [];
      cache = { key, labels: new Map(list.map((tick) => [tick.valueHz, tick.label])) };
    }
    return cache.labels;
  };
  return {
    label: 'Frequency',
    labelFont,
    font: axisFont,
    stroke: chartColours.axis,
    grid: { stroke: chartColours.grid, width: 1 },
    ticks: { stroke: chartColours.gridDecade, width: 1, size: 5 },
    splits: (u) => [...ticks(u.scales.x.min ?? 1, u.scales.x.max ?? 10).keys()],
    values: (u, splits) => {
      const labels = ticks(u.scales.x.min ?? 1, u.scales.x.max ?? 10);
      return splits.map((value) => labels.get(value) ?? '');
    },
  };
}

/**
 * One uPlot chart on a log frequency axis over a fixed series list. Created once; later data go in
 * through setData (keeping the zoom while zoomed), trace toggles through setSeries. Drag across to
 * zoom, double-click to reset; the cursor is shared with the other charts of `syncKey`, and so is
 * the zoom. Hover readout below the plot lists every visible series with its unit.
 */
export function LogFrequencyChart(props: LogFrequencyChartProps) {
  const container = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const latest = useRef(props);
  const drawnVersion = useRef(props.version);
  const zoomed = useRef(false);
  const [cursorIndex, setCursorIndex] = useState<number | null>(null);

  useLayoutEffect(() => {
    latest.current = props;
  });

  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const initial = latest.current;
    const styleFor = initial.styleFor ?? ((entry: FixedSeries) => seriesStyle(entry.key, entry.role));
    const indexOf = (key: string) => initial.fixed.findIndex((entry) => entry.key === key) + 1;
    const series: uPlot.Series[] = [
      {},
      ...initial.fixed.map((entry): uPlot.Series => {
        const style = styleFor(entry);
        const marker = style.marker;
        return {
          label: entry.label,
          stroke: style.colour,
          width: style.lineWidth,
          dash: style.dash,
          spanGaps: style.spanGaps,
          show: !initial.hidden.has(entry.group),
          ...(style.lineWidth === 0 && !marker ? { width: 0 } : {}),
          ...(style.lineWidth === 0 && marker ? { paths: () => null } : {}),
          points: marker
            ? { show: true, paths: markerPaths(marker.shape, marker.sizePx, marker.filled), stroke: style.colour, fill: marker.filled ? style.colour : 'rgba(0,0,0,0)', width: 1.25 }
            : { show: false },
        };
      }),
    ];
    const options: uPlot.Options = {
      width: Math.max(320, element.clientWidth),
      height: initial.height,
      padding: [10, 30, 0, 4],
      legend: { show: false },
      scales: {
        x: { time: false, distr: 3, log: 10 },
        // An empty chart (before its first data) gets a plain 0–100 dB frame rather than ±3 dB around nothing.
        y: { auto: true, range: (_u, min, max) => latest.current.yRangeDb ?? (min === null || max === null ? [0, 100] : [Math.floor(min - 3), Math.ceil(max + 3)]) },
      },
      axes: [
        frequencyAxis(),
        { label: initial.yLabel, labelFont, font: axisFont, stroke: chartColours.axis, grid: { stroke: chartColours.grid, width: 1 }, size: 56 },
      ],
      bands: (initial.bands ?? []).map((band) => ({ series: [indexOf(band.upperKey), indexOf(band.lowerKey)] as [number, number], fill: band.fill })),
      series,
      cursor: {
        sync: { key: initial.syncKey, setSeries: false },
        drag: { x: true, y: false, setScale: true },
        points: { size: 7, width: 1.5 },
      },
      hooks: {
        setCursor: [(u) => setCursorIndex(u.cursor.idx ?? null)],
        setScale: [
          (u, key) => {
            if (key !== 'x') return;
            const xs = u.data[0];
            const min = u.scales.x.min ?? 0;
            const max = u.scales.x.max ?? 0;
            zoomed.current = xs.length > 1 && (min > xs[0] * 1.0001 || max < xs[xs.length - 1] * 0.9999);
            for (const other of uPlot.sync(latest.current.syncKey).plots) {
              if (other === u) continue;
              if (other.scales.x.min !== min || other.scales.x.max !== max) other.setScale('x', { min, max });
            }
          },
        ],
        draw: [() => latest.current.onDrawn?.(drawnVersion.current)],
      },
    };
    const created = new uPlot(options, initial.chart.data as uPlot.AlignedData, element);
    plot.current = created;
    const observer = new ResizeObserver(() => {
      const width = Math.max(320, element.clientWidth);
      if (Math.abs(width - created.width) > 1) created.setSize({ width, height: latest.current.height });
    });
    observer.observe(element);
    return () => {
      observer.disconnect();
      created.destroy();
      plot.current = null;
    };
  }, []);

  useEffect(() => {
    const u = plot.current;
    if (!u || u.data === (props.chart.data as uPlot.AlignedData)) return;
    drawnVersion.current = props.version;
    u.setData(props.chart.data as uPlot.AlignedData, !zoomed.current);
    if (zoomed.current) u.redraw(false, true);
  }, [props.chart, props.version]);

  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    props.fixed.forEach((entry, index) => {
      const show = !props.hidden.has(entry.group);
      if (u.series[index + 1].show !== show) u.setSeries(index + 1, { show });
    });
  }, [props.hidden, props.fixed]);

  const readout = cursorIndex === null ? null : readoutAt(props.fixed, props.chart, cursorIndex, (group) => !props.hidden.has(group));
  return (
    <figure className="space-y-1" aria-label={props.title}>
      <figcaption className="text-[0.9375rem] font-semibold text-ink-800">{props.title}</figcaption>
      <div className="relative">
        <div ref={container} className="w-full" role="img" aria-label={props.description} style={{ minHeight: props.height }} />
        {props.placeholder && (
          <div className="absolute inset-0 flex items-center justify-center rounded-md bg-white/85 text-ink-700" role="status">
            {props.placeholder}
          </div>
        )}
      </div>
      <div className="min-h-[3.25rem] rounded-md bg-ink-50 px-3 py-1.5 text-[0.875rem] text-ink-800" data-testid="chart-readout">
        {readout ? (
          <>
            <span className="tabular font-medium">{readout.frequency}</span>
            {readout.rows.map((row) => (
              <span key={row.key} className="ml-3 inline-block">
                {row.label} <span className="tabular">{row.text}</span>
              </span>
            ))}
          </>
        ) : props.placeholder ? (
          <span className="text-ink-600">Hover readouts and zoom come with the data.</span>
        ) : (
          <span className="text-ink-600">Point at the chart to read every trace at one frequency; drag across to zoom, double-click to show all.</span>
        )}
      </div>
    </figure>
  );
}
