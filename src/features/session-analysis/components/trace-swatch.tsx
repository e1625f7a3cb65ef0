import { bandFills } from './chart-styles';
import { seriesStyle } from './chart-styles';
import type { FixedSeries } from './chart-series';

/** A legend sample drawn with the trace's own colour, dash and marker (docs/CHARTS.md), so the key reads in grey print too. */
export function TraceSwatch({ entry, band }: { entry: FixedSeries; band?: keyof typeof bandFills }) {
  const style = seriesStyle(entry.key, entry.role);
  const marker = style.marker;
  const half = (marker?.sizePx ?? 0) / 2 + 1;
  return (
    <svg width="34" height="14" viewBox="0 0 34 14" aria-hidden="true" className="shrink-0">
      {band && <rect x="0" y="2" width="34" height="10" fill={bandFills[band]} />}
      {style.lineWidth > 0 && <line x1="1" y1="7" x2="33" y2="7" stroke={style.colour} strokeWidth={Math.max(1, style.lineWidth)} strokeDasharray={style.dash?.join(' ')} />}
      {marker && marker.shape === 'square' && <rect x={17 - half} y={7 - half} width={2 * half} height={2 * half} fill={marker.filled ? style.colour : 'white'} stroke={style.colour} />}
      {marker && (marker.shape === 'circle' || marker.shape === 'ring') && <circle cx="17" cy="7" r={half} fill={marker.filled ? style.colour : 'white'} stroke={style.colour} strokeWidth="1.25" />}
      {marker && marker.shape === 'triangle-up' && <path d={`M17 ${7 - half}L${17 + half} ${7 + half}H${17 - half}Z`} fill="white" stroke={style.colour} strokeWidth="1.25" />}
      {marker && marker.shape === 'triangle-down' && <path d={`M17 ${7 + half}L${17 + half} ${7 - half}H${17 - half}Z`} fill="white" stroke={style.colour} strokeWidth="1.25" />}
      {marker && marker.shape === 'diamond' && <path d={`M17 ${7 - half}L${17 + half} 7L17 ${7 + half}L${17 - half} 7Z`} fill={marker.filled ? style.colour : 'white'} stroke={style.colour} />}
    </svg>
  );
}
