import { monitorCurve, monitorSpec, modelTurningPoints, type Design } from '../design';

/** What the design says the monitor shows for one layer on its witness chip (fractions, 0–1). */
export interface ExpectedLayer {
  layer: number;
  chip: number;
  /** Signal when the layer starts (the chip's stack below it, or the bare chip). */
  startLevel: number;
  /** Signal where the layer is cut: at the design thickness, or for a turning-point cut at the extremum nearest it. */
  endLevel: number;
  /** Signals at the turning points strictly inside the layer (not at its ends). */
  turningPointLevels: number[];
  /** Highest signal over the layer. */
  maxLevel: number;
  /** The signal at SHAPE_POINTS + 1 evenly spaced thicknesses from the start to where the layer is cut. */
  shape: Float64Array;
}

/** Intervals of the `shape` table. */
export const SHAPE_POINTS = 100;

/**
 * The design's modelled monitor signal at each layer's start, end and inner turning points, from
 * the growing-layer model on the chip's design stack (design/monitorCurve). A turning-point cut
 * ends at the model extremum nearest the design thickness (within half a quarter-wave), which is
 * then not an inner one; a turning point within 3 % of a quarter-wave of the start is not inner either.
 */
export function expectedLevels(design: Design): ExpectedLayer[] {
  const out: ExpectedLayer[] = [];
  for (const l of design.layers) {
    const spec = monitorSpec(design, l.layer, { pol: 's' });
    const qwNm = spec.wavelengthNm / (4 * spec.growing.re);
    const grid = new Float64Array(65);
    for (let i = 0; i < grid.length; i++) grid[i] = (l.thicknessNm * i) / (grid.length - 1);
    const y = monitorCurve(design, l.layer, grid, { pol: 's' });
    const margin = 0.03 * qwNm;
    let inner = modelTurningPoints(spec, margin, l.thicknessNm + 0.5 * qwNm);
    let endLevel = y[y.length - 1];
    let cutNm = l.thicknessNm;
    if (l.monitor.cut === 'turning-point') {
      // a turning-point cut stops at the extremum nearest the design thickness, wherever the design's own end lies
      const nearest = inner.reduce<(typeof inner)[number] | null>((b, p) => (!b || Math.abs(p.thicknessNm - l.thicknessNm) < Math.abs(b.thicknessNm - l.thicknessNm) ? p : b), null);
      if (nearest && Math.abs(nearest.thicknessNm - l.thicknessNm) < 0.5 * qwNm) {
        endLevel = nearest.signal;
        cutNm = nearest.thicknessNm;
        inner = inner.filter((p) => p.thicknessNm < nearest.thicknessNm - margin);
      } else inner = inner.filter((p) => p.thicknessNm < l.thicknessNm - margin);
    } else inner = inner.filter((p) => p.thicknessNm < l.thicknessNm - margin);
    // on the same chip a layer starts where the one before it was cut
    const before = out[out.length - 1];
    const startLevel = before && before.chip === l.monitor.chip ? before.endLevel : y[0];
    const shapeGrid = new Float64Array(SHAPE_POINTS + 1);
    for (let i = 0; i <= SHAPE_POINTS; i++) shapeGrid[i] = (cutNm * i) / SHAPE_POINTS;
    out.push({
      layer: l.layer, chip: l.monitor.chip, startLevel, endLevel,
      turningPointLevels: inner.map((p) => p.signal), maxLevel: Math.max(...y, endLevel, ...inner.map((p) => p.signal)),
      shape: monitorCurve(design, l.layer, shapeGrid, { pol: 's' }),
    });
  }
  return out;
}
