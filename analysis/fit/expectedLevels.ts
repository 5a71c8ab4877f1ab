import { monitorCurve, monitorSpec, modelTurningPoints, type Design } from '../design';

/** What the design says the monitor shows for one layer on its witness chip (fractions, 0–1). */
export interface ExpectedLayer {
  layer: number;
  chip: number;
  /** Signal when the layer starts (the chip's stack below it, or the bare chip). */
  startLevel: number;
  /** Signal at the design thickness (where the layer is cut). */
  endLevel: number;
  /** Signals at the turning points strictly inside the layer (not at its ends). */
  turningPointLevels: number[];
  /** Highest signal over the layer. */
  maxLevel: number;
}

/**
 * The design's modelled monitor signal at each layer's start, end and inner turning points, from
 * the growing-layer model on the chip's design stack (design/monitorCurve). A turning point within
 * 3 % of a quarter-wave of either end counts as that end (a turning-point cut), not an inner one.
 */
export function expectedLevels(design: Design): ExpectedLayer[] {
  return design.layers.map((l) => {
    const spec = monitorSpec(design, l.layer, { pol: 's' });
    const qwNm = spec.wavelengthNm / (4 * spec.growing.re);
    const grid = new Float64Array(65);
    for (let i = 0; i < grid.length; i++) grid[i] = (l.thicknessNm * i) / (grid.length - 1);
    const y = monitorCurve(design, l.layer, grid, { pol: 's' });
    const margin = 0.03 * qwNm;
    const inner = modelTurningPoints(spec, margin, l.thicknessNm - margin);
    return {
      layer: l.layer, chip: l.monitor.chip, startLevel: y[0], endLevel: y[y.length - 1],
      turningPointLevels: inner.map((p) => p.signal), maxLevel: Math.max(...y, ...inner.map((p) => p.signal)),
    };
  });
}
