// Marker shapes for uPlot series (docs/CHARTS.md): uPlot draws round points only, so each shape is
// built here as one Path2D per series and stroked/filled by uPlot with the series' point colours.
import uPlot from 'uplot';
/** Marker shapes of docs/CHARTS.md. */
export type MarkerShape = 'circle' | 'square' | 'triangle-up' | 'triangle-down' | 'diamond' | 'ring';

function addShape(path: Path2D, shape: MarkerShape, x: number, y: number, size: number): void {
  const half = size / 2;
  switch (shape) {
    case 'circle':
    case 'ring':
      path.moveTo(x + half, y);
      path.arc(x, y, half, 0, 2 * Math.PI);
      return;
    case 'square':
      path.rect(x - half, y - half, size, size);
      return;
    case 'triangle-up':
      path.moveTo(x, y - half);
      path.lineTo(x + half, y + half);
      path.lineTo(x - half, y + half);
      path.closePath();
      return;
    case 'triangle-down':
      path.moveTo(x, y + half);
      path.lineTo(x + half, y - half);
      path.lineTo(x - half, y - half);
      path.closePath();
      return;
    case 'diamond':
      path.moveTo(x, y - half);
      path.lineTo(x + half, y);
      path.lineTo(x, y + half);
      path.lineTo(x - half, y);
      path.closePath();
      return;
  }
}

/** A uPlot points path builder drawing `shape` markers of `sizePx` CSS pixels; open shapes are only stroked. */
export function markerPaths(shape: MarkerShape, sizePx: number, filled: boolean): uPlot.Series.Points.PathBuilder {
  return (u, seriesIdx, idx0, idx1) => {
    const xs = u.data[0];
    const ys = u.data[seriesIdx];
    const size = sizePx * uPlot.pxRatio;
    const path = new Path2D();
    const { left, top, width, height } = u.bbox;
    // One marker per cell of a third of the marker's size: where thousands of points crowd a few
    // pixels, the markers hidden under their neighbours are not drawn (the picture is the same).
    const cell = Math.max(1, size / 3);
    const drawn = new Set<number>();
    for (let index = idx0; index <= idx1; index++) {
      const value = ys[index];
      if (value === null || value === undefined) continue;
      const x = u.valToPos(xs[index], 'x', true);
      const y = u.valToPos(value, u.series[seriesIdx].scale ?? 'y', true);
      if (x < left - size || x > left + width + size || y < top - size || y > top + height + size) continue;
      const key = Math.round(x / cell) * 100_000 + Math.round(y / cell);
      if (drawn.has(key)) continue;
      drawn.add(key);
      addShape(path, shape, x, y, size);
    }
    return { stroke: path, fill: filled ? path : null };
  };
}
