import { memo, useEffect, useMemo, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { bandFill, chartColours, decibelAxis, drawVerticalMarker, logFrequencyAxis, seriesForRole } from './chart-style';
import { designReadout, type DesignChart } from './design-chart-data';

/** Trace groups the reader can switch off, and the series keys in each. */
const traceGroups = [
  { id: 'prediction', label: 'Nominal prediction and op-amp-sign band', keys: ['cmrr-predicted', 'cmrr-predicted-low', 'cmrr-predicted-high'] },
  { id: 'monte-carlo', label: 'Monte Carlo 5–95 % band and median', keys: ['cmrr-mc-p05', 'cmrr-mc-p50', 'cmrr-mc-p95'] },
  { id: 'worst-case', label: 'Worst case', keys: ['cmrr-worst-case'] },
  { id: 'limit', label: 'Limit mask', keys: ['limit', 'limit-guard'] },
] as const;

type Props = {
  chart: DesignChart;
  chosenFrequencyHz: number | null;
  onPickFrequency?: (frequencyHz: number) => void;
};

/**
 * Predicted CMRR against log frequency (uPlot): prediction with its op-amp-sign band, Monte Carlo
 * band and median, worst case, limit; a hover readout below; a click picks the histogram's
 * frequency. Loaded with its own chunk (uPlot travels with it).
 */
function PredictionChart({ chart, chosenFrequencyHz, onPickFrequency }: Props) {
  const container = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const chosen = useRef(chosenFrequencyHz);
  const pick = useRef(onPickFrequency);
  const [cursorIndex, setCursorIndex] = useState<number | null>(null);
  const [hidden, setHidden] = useState<Set<string>>(() => new Set());
  const hiddenRef = useRef(hidden);
  const structure = chart.series.map((series) => series.key).join('|');

  useEffect(() => {
    pick.current = onPickFrequency;
  }, [onPickFrequency]);

  // Created when the set of series changes; otherwise only its data are replaced (no flicker while exploring).
  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const keys = structure.split('|');
    const options: uPlot.Options = {
      width: Math.max(320, element.clientWidth),
      height: 340,
      padding: [14, 30, 0, 4],
      scales: { x: { time: false, distr: 3, log: 10 }, y: { auto: false } },
      axes: [logFrequencyAxis(), decibelAxis()],
      legend: { show: false },
      cursor: { drag: { x: false, y: false }, points: { show: false } },
      series: [{ label: 'Frequency' }, ...chart.series.map((series) => ({ ...seriesForRole(series.role, series.label), show: !hiddenRef.current.has(series.key) }))],
      bands: chart.bands.map((band) => ({ series: [keys.indexOf(band.upperKey) + 1, keys.indexOf(band.lowerKey) + 1] as [number, number], fill: bandFill(band.role) })),
      hooks: {
        setCursor: [(u) => setCursorIndex(u.cursor.idx ?? null)],
        draw: [
          (u) => {
            if (chosen.current !== null) drawVerticalMarker(u, chosen.current, { colour: chartColours.chosen, dash: [4, 3], label: `histogram at ${formatFrequencyHz(chosen.current)}` });
          },
        ],
      },
    };
    const created = new uPlot(options, [[], ...keys.map(() => [])] as unknown as uPlot.AlignedData, element);
    plot.current = created;
    const onClick = () => {
      const left = created.cursor.left;
      if (left === undefined || left < 0 || !pick.current) return;
      const value = created.posToVal(left, 'x');
      if (Number.isFinite(value) && value > 0) pick.current(Number(value.toPrecision(2)));
    };
    created.over.addEventListener('click', onClick);
    const resize = new ResizeObserver(() => created.setSize({ width: Math.max(320, element.clientWidth), height: 340 }));
    resize.observe(element);
    return () => {
      resize.disconnect();
      created.over.removeEventListener('click', onClick);
      created.destroy();
      plot.current = null;
    };
    // Rebuilt only when the series change; data arrive through the next effect.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [structure]);

  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    chosen.current = chosenFrequencyHz;
    if (chart.yRangeDb) u.setScale('y', { min: chart.yRangeDb[0], max: chart.yRangeDb[1] });
    u.setData([chart.frequencyHz, ...chart.series.map((series) => series.values)] as unknown as uPlot.AlignedData, true);
    if (chart.yRangeDb) u.setScale('y', { min: chart.yRangeDb[0], max: chart.yRangeDb[1] });
  }, [chart, chosenFrequencyHz, structure]);

  const toggle = (groupKeys: readonly string[], show: boolean) => {
    const next = new Set(hidden);
    for (const key of groupKeys) {
      if (show) next.delete(key);
      else next.add(key);
      const index = chart.series.findIndex((series) => series.key === key);
      if (index >= 0) plot.current?.setSeries(index + 1, { show });
    }
    hiddenRef.current = next;
    setHidden(next);
  };

  const readout = useMemo(() => (cursorIndex !== null && cursorIndex < chart.frequencyHz.length ? designReadout(chart, cursorIndex) : null), [chart, cursorIndex]);
  const present = new Set(chart.series.map((series) => series.key));

  return (
    <div>
      <div ref={container} className="w-full cursor-crosshair" role="img" aria-label="Predicted CMRR against frequency: nominal prediction with the op-amp-sign band, Monte Carlo 5–95 % band, worst case and the limit mask" />
      <div className="mt-2 min-h-[3.25rem] rounded-md bg-ink-50 px-3 py-2 text-[0.875rem] text-ink-800" aria-live="off" data-testid="prediction-readout">
        {readout ? (
          <p className="flex flex-wrap gap-x-4 gap-y-1">
            <span className="tabular font-semibold">{formatFrequencyHz(readout.frequencyHz)}</span>
            {readout.predictedDb !== null && (
              <span>
                Predicted <span className="tabular">{formatDb(readout.predictedDb)}</span>
                {readout.signBandDb && (
                  <span className="text-ink-600">
                    {' '}
                    (<span className="tabular">{formatDb(readout.signBandDb[0])}</span>–<span className="tabular">{formatDb(readout.signBandDb[1])}</span> between the op-amp signs)
                  </span>
                )}
              </span>
            )}
            {readout.monteCarloDb && (
              <span>
                Monte Carlo 5/50/95 % <span className="tabular">{formatDb(readout.monteCarloDb.p05)}</span> / <span className="tabular">{formatDb(readout.monteCarloDb.p50)}</span> /{' '}
                <span className="tabular">{formatDb(readout.monteCarloDb.p95)}</span>
              </span>
            )}
            {readout.worstCaseDb !== null && (
              <span>
                Worst case <span className="tabular">{formatDb(readout.worstCaseDb)}</span>
              </span>
            )}
            {readout.limitDb !== null && (
              <span>
                Limit <span className="tabular">{formatDb(readout.limitDb)}</span>
                {readout.p05MarginDb !== null && (
                  <span className="text-ink-600">
                    {' '}
                    — 5th percentile {readout.p05MarginDb >= 0 ? 'clears it by' : 'misses it by'} <span className="tabular">{formatDb(Math.abs(readout.p05MarginDb))}</span>
                  </span>
                )}
              </span>
            )}
          </p>
        ) : (
          <p className="text-ink-600">Point at the chart to read every curve at one frequency; click to move the histogram there.</p>
        )}
      </div>
      <fieldset className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-[0.9375rem] text-ink-800">
        <legend className="sr-only">Traces shown</legend>
        {traceGroups
          .filter((group) => group.keys.some((key) => present.has(key)))
          .map((group) => (
            <label key={group.id} className="inline-flex items-center gap-2">
              <input type="checkbox" checked={!group.keys.every((key) => hidden.has(key))} onChange={(event) => toggle(group.keys, event.target.checked)} />
              <TraceSwatch group={group.id} />
              {group.label}
            </label>
          ))}
      </fieldset>
    </div>
  );
}

// Redrawn only when its data change, not on every progress update of the page.
export default memo(PredictionChart);

/** A small drawing of the trace's line style beside its toggle (the chart has no legend of its own). */
function TraceSwatch({ group }: { group: (typeof traceGroups)[number]['id'] }) {
  const line = {
    prediction: { stroke: chartColours.prediction, dash: '6 4', width: 1.5, fill: 'rgba(242,181,68,0.35)' },
    'monte-carlo': { stroke: chartColours.sky, dash: '1 3', width: 1.5, fill: 'rgba(90,163,214,0.3)' },
    'worst-case': { stroke: chartColours.worstCase, dash: '2 2', width: 1, fill: 'none' },
    limit: { stroke: chartColours.limit, dash: '8 3 2 3', width: 2, fill: 'none' },
  }[group];
  return (
    <svg viewBox="0 0 28 12" className="h-3 w-7" aria-hidden="true">
      {line.fill !== 'none' && <rect x="0" y="2" width="28" height="8" fill={line.fill} />}
      <line x1="0" y1="6" x2="28" y2="6" stroke={line.stroke} strokeWidth={line.width} strokeDasharray={line.dash} />
    </svg>
  );
}
