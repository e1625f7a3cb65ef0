// The session view's charts (their own download, with uPlot): CMRR and the two gains on a log
// frequency axis with shared cursor, zoom and trace toggles, and the small residual plot.
import { useMemo } from 'react';
import type { SessionCharts as PreparedSessionCharts } from '../../../lib/charts/session-chart-data';
import { bandFills, chartColours, type SeriesStyle } from './chart-styles';
import { cmrrBands, cmrrSeries, gainSeries, traceGroupLabels, type FixedChartData, type FixedSeries, type TraceGroup } from './chart-series';
import type { ResidualPlotData } from './analysis-figures';
import { LogFrequencyChart } from './log-frequency-chart';
import { TraceSwatch } from './trace-swatch';

export interface SessionChartsProps {
  cmrr: FixedChartData;
  gains: FixedChartData;
  prepared: Pick<PreparedSessionCharts, 'cmrr' | 'gains' | 'totalPointCount' | 'keptPointCount'>;
  version: number;
  hidden: ReadonlySet<TraceGroup>;
  onToggle: (group: TraceGroup, visible: boolean) => void;
  onDrawn: (chart: 'cmrr' | 'gains', version: number) => void;
  syncKey: string;
  /** The analysis is on its way: the charts stand laid out and empty under a note. */
  pending?: boolean;
}

const groupOrder: TraceGroup[] = ['measured', 'bounds', 'failing', 'fit', 'prediction', 'monte-carlo', 'limit'];

/** A representative series of each toggle group, for its swatch. */
const groupSwatch: Record<TraceGroup, FixedSeries> = Object.fromEntries(
  groupOrder.map((group) => [group, cmrrSeries.find((entry) => entry.group === group && !entry.role.endsWith('band-edge')) ?? cmrrSeries.find((entry) => entry.group === group)!]),
) as Record<TraceGroup, FixedSeries>;

export default function SessionCharts(props: SessionChartsProps) {
  const presentGroups = new Set<TraceGroup>();
  cmrrSeries.forEach((entry, index) => props.cmrr.present[index] && presentGroups.add(entry.group));
  gainSeries.forEach((entry, index) => props.gains.present[index] && presentGroups.add(entry.group));
  // What both charts share: data version, hidden groups, cursor and zoom, the note while pending.
  const shared = { version: props.version, hidden: props.hidden, syncKey: props.syncKey, placeholder: props.pending ? 'Analysing the sweeps…' : undefined };
  const bands = cmrrBands.map((band) => ({ lowerKey: band.lowerKey, upperKey: band.upperKey, fill: bandFills[band.role] }));
  return (
    <div className="space-y-4">
      <fieldset className="flex min-h-[2.75rem] flex-wrap gap-x-4 gap-y-2 rounded-md border border-ink-200 px-3 py-2">
        <legend className="px-1 text-[0.9375rem] font-medium text-ink-700">Traces</legend>
        {props.pending && <span className="text-[0.9375rem] text-ink-600">The traces appear with the analysis.</span>}
        {groupOrder
          .filter((group) => !props.pending && presentGroups.has(group))
          .map((group) => (
            <label key={group} className="inline-flex cursor-pointer items-center gap-2 text-[0.9375rem] text-ink-800">
              <input type="checkbox" className="h-4 w-4 accent-trace-600" checked={!props.hidden.has(group)} onChange={(event) => props.onToggle(group, event.target.checked)} />
              <TraceSwatch entry={groupSwatch[group]} band={group === 'monte-carlo' ? 'monte-carlo-band' : group === 'prediction' ? 'op-amp-sign-band' : undefined} />
              {traceGroupLabels[group]}
            </label>
          ))}
      </fieldset>
      {props.prepared.keptPointCount < props.prepared.totalPointCount && (
        <p className="text-[0.875rem] text-ink-600">
          Drawn from <span className="tabular">{props.prepared.keptPointCount.toLocaleString('en')}</span> of{' '}
          <span className="tabular">{props.prepared.totalPointCount.toLocaleString('en')}</span> points: each pixel column keeps its first, last, lowest and highest
          reading and every failing one, so the picture is unchanged.
        </p>
      )}
      <LogFrequencyChart
        title="Common-mode rejection ratio"
        description="CMRR in dB against frequency on a logarithmic axis: measured points and lower bounds, the fit, the design's prediction with its bands, and the limit mask"
        {...shared}
        fixed={cmrrSeries}
        chart={props.cmrr}
        yRangeDb={props.prepared.cmrr.yRangeDb}
        yLabel="CMRR (dB)"
        height={320}
        bands={bands}
        onDrawn={(version) => props.onDrawn('cmrr', version)}
      />
      <LogFrequencyChart
        title="Differential and common-mode gain"
        description="Differential gain |Ad| (squares) and common-mode gain |Acm| (circles, floor-limited readings as downward triangles) in dB against frequency, with fitted and predicted curves"
        {...shared}
        fixed={gainSeries}
        chart={props.gains}
        yRangeDb={props.prepared.gains.yRangeDb}
        yLabel="Gain (dB)"
        height={260}
        onDrawn={(version) => props.onDrawn('gains', version)}
      />
    </div>
  );
}

const residualSeries: readonly FixedSeries[] = [
  { key: 'residual-resolved', role: 'measured-value', label: 'Residual', group: 'measured' },
  { key: 'residual-bound', role: 'measured-bound', label: 'Residual of a bound', group: 'bounds' },
];
const residualStyle = (entry: FixedSeries): SeriesStyle =>
  entry.key === 'residual-bound'
    ? { colour: chartColours.trace, lineWidth: 0, marker: { shape: 'triangle-up', sizePx: 7, filled: false }, spanGaps: false }
    : { colour: chartColours.trace, lineWidth: 0, marker: { shape: 'circle', sizePx: 4, filled: true }, spanGaps: false };
const noneHidden: ReadonlySet<TraceGroup> = new Set();

/** Measured minus fitted CMRR against frequency: a pattern here means the model misses something. */
export function ResidualChart({ residuals, version, syncKey }: { residuals: ResidualPlotData; version: number; syncKey: string }) {
  const { chart, span } = useMemo(() => {
    let largest = 1;
    for (const value of [...residuals.resolvedDb, ...residuals.boundDb]) if (value !== null && Math.abs(value) > largest) largest = Math.abs(value);
    const aligned: FixedChartData = {
      data: [residuals.frequencyHz, residuals.resolvedDb, residuals.boundDb],
      labels: residualSeries.map((entry) => entry.label),
      present: [residuals.resolvedDb.some((value) => value !== null), residuals.boundDb.some((value) => value !== null)],
    };
    return { chart: aligned, span: Math.ceil(largest + 0.5) };
  }, [residuals]);
  const yRangeDb = useMemo((): [number, number] => [-span, span], [span]);
  return (
    <LogFrequencyChart
      title="Residuals (measured − fitted)"
      description="Residuals of the fit in dB against frequency"
      fixed={residualSeries}
      chart={chart}
      version={version}
      yRangeDb={yRangeDb}
      yLabel="dB"
      height={150}
      hidden={noneHidden}
      syncKey={syncKey}
      styleFor={residualStyle}
    />
  );
}
