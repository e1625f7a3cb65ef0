import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';

// Colours from the palette (docs/VISUAL-IDENTITY.md): measured in trace blue, fit in ink,
// prediction in bluish green, limit in vermilion; each also differs in dash and marker.
const colours = { measured: '#1d5fa0', fit: '#16242e', prediction: '#007a5e', limit: '#a63e08', grid: '#e8edf0', axis: '#4a6275' };

/** Compact CMRR (dB) against log frequency: measured points, the fit, the prediction and the limit. Loaded with its own chunk. */
export default function CmrrChart({ analysis }: { analysis: SessionAnalysis }) {
  const container = useRef<HTMLDivElement>(null);
  const chart = useRef<uPlot | null>(null);

  useEffect(() => {
    const element = container.current;
    if (!element) return;
    const frequencies = analysis.points.map((point) => point.frequencyHz);
    const measured = analysis.points.map((point) => point.cmrrDb);
    const fitted = analysis.fit && analysis.fit.fittedCmrrDb.length === frequencies.length ? analysis.fit.fittedCmrrDb : frequencies.map(() => null);
    const predicted = analysis.prediction.length === frequencies.length ? analysis.prediction.map((point) => point.cmrrDb) : frequencies.map(() => null);
    const limit = analysis.limits && analysis.limits.verdicts.length === frequencies.length ? analysis.limits.verdicts.map((verdict) => verdict.limitDb) : frequencies.map(() => null);
    const data: uPlot.AlignedData = [frequencies, measured, fitted, predicted, limit];
    const width = Math.max(320, element.clientWidth);
    const options: uPlot.Options = {
      width,
      height: 280,
      padding: [12, 36, 0, 0],
      scales: { x: { time: false, distr: 3 }, y: { auto: true } },
      axes: [
        { label: 'Frequency (Hz)', stroke: colours.axis, grid: { stroke: colours.grid }, font: '13px "JetBrains Mono", monospace', labelFont: '14px "IBM Plex Sans", sans-serif' },
        { label: 'CMRR (dB)', stroke: colours.axis, grid: { stroke: colours.grid }, font: '13px "JetBrains Mono", monospace', labelFont: '14px "IBM Plex Sans", sans-serif', size: 60 },
      ],
      legend: { show: true },
      series: [
        { label: 'Frequency', value: (_u, value) => (value == null ? '—' : `${Number(value.toPrecision(4))} Hz`) },
        { label: 'Measured', stroke: colours.measured, paths: () => null, points: { show: true, size: 7, stroke: colours.measured, fill: colours.measured }, value: (_u, value) => (value == null ? '—' : `${value.toFixed(1)} dB`) },
        { label: 'Fit', stroke: colours.fit, width: 2, points: { show: false }, value: (_u, value) => (value == null ? '—' : `${value.toFixed(1)} dB`) },
        { label: 'Predicted', stroke: colours.prediction, width: 2, dash: [8, 5], points: { show: false }, value: (_u, value) => (value == null ? '—' : `${value.toFixed(1)} dB`) },
        { label: 'Limit', stroke: colours.limit, width: 2, dash: [3, 4], points: { show: false }, value: (_u, value) => (value == null ? '—' : `${value.toFixed(1)} dB`) },
      ],
    };
    chart.current?.destroy();
    chart.current = frequencies.length >= 2 ? new uPlot(options, data, element) : null;
    return () => {
      chart.current?.destroy();
      chart.current = null;
    };
  }, [analysis]);

  return <div ref={container} className="w-full" role="img" aria-label="CMRR against frequency: measured points, fit, prediction and limit mask" />;
}
