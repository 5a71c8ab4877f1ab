import { growingLayerSignal } from '../optics/growingLayer';
import { type Design } from './parseDesign';
import { monitorSpec } from './monitorCurve';
import { modelTurningPoints, type ModelTurningPoint } from './modelTurningPoints';

/**
 * Rule-of-thumb thresholds (common practice, not from a published source):
 * a level cut is poorly conditioned where 1 nm of growth moves the signal by less than about the
 * noise of a monitor (~0.1 % of full scale), or within a tenth of a quarter-wave of a turning
 * point; a layer whose signal swings by less than ~2 % is hard to monitor at all.
 */
export const PLAN_THRESHOLDS = {
  /** |signal change| per nm below which a level cut is flat. */
  flatSlopePerNm: 0.001,
  /** Distance to a turning point, in quarter-waves at the monitor wavelength, below which a level cut is flat. */
  nearTurningPointQw: 0.1,
  /** swingPct below which the layer's signal change is too small to monitor. */
  minSwingPct: 2,
  /** A turning point this close to the layer's end (quarter-waves) counts as the end. */
  endToleranceQw: 0.001,
} as const;

export interface PlanWarning {
  code: 'flat-level-cut' | 'small-swing' | 'cut-not-at-turning-point';
  message: string;
}

export interface PlanLayer {
  layer: number;
  material: string;
  wavelengthNm: number;
  mode: 'T' | 'R';
  chip: number;
  cut: 'turning-point' | 'level';
  thicknessNm: number;
  /** Optical thickness in quarter-waves at the monitor wavelength. */
  qwotAtMonitor: number;
  /** Extrema passed inside the layer, one at its end included (shared/FORMATS.md). */
  turningPoints: number;
  turningPointList: ModelTurningPoint[];
  /** The first turning point after the layer's end, if one lies within a quarter-wave of it. */
  nextTurningPoint: ModelTurningPoint | null;
  startSignal: number;
  cutSignal: number;
  /** 100·(max − min)/max of the modelled signal over the layer, 0 → thicknessNm. */
  swingPct: number;
  minSignal: number;
  maxSignal: number;
  /** d(signal)/d(thickness) at the cut, per nm: a signal error δs moves a level cut by δs/slope nm. */
  slopePerNm: number;
  warnings: PlanWarning[];
}

/** The monitoring plan of one design layer (see PlanLayer). */
export function planLayer(design: Design, layerNo: number): PlanLayer {
  const spec = monitorSpec(design, layerNo);
  const layer = design.layers[layerNo - 1];
  const t = layer.thicknessNm;
  const qwNm = spec.wavelengthNm / (4 * spec.growing.re);
  const endTolNm = PLAN_THRESHOLDS.endToleranceQw * qwNm;

  const tps = modelTurningPoints(spec, 0, t + qwNm * 1.05);
  const inside = tps.filter((p) => p.thicknessNm > endTolNm && p.thicknessNm <= t + endTolNm);
  const after = tps.find((p) => p.thicknessNm > t + endTolNm && p.thicknessNm <= t + qwNm) ?? null;

  const h = 1e-4 * qwNm;
  const count = Math.max(201, Math.ceil(t / (qwNm / 200)) + 1);
  const grid = new Float64Array(count + 2);
  for (let i = 0; i < count; i++) grid[i] = (t * i) / (count - 1);
  grid[count] = t - h;
  grid[count + 1] = t + h;
  const y = growingLayerSignal(spec, grid);
  let minSignal = Infinity;
  let maxSignal = -Infinity;
  for (let i = 0; i < count; i++) {
    minSignal = Math.min(minSignal, y[i]);
    maxSignal = Math.max(maxSignal, y[i]);
  }
  for (const p of inside) {
    if (p.thicknessNm > t) continue;
    minSignal = Math.min(minSignal, p.signal);
    maxSignal = Math.max(maxSignal, p.signal);
  }
  const startSignal = y[0];
  const cutSignal = y[count - 1];
  const slopePerNm = (y[count + 1] - y[count]) / (2 * h);
  const swingPct = maxSignal > 0 ? (100 * (maxSignal - minSignal)) / maxSignal : 0;

  const warnings: PlanWarning[] = [];
  const where = `layer ${layerNo} (${layer.material}, ${t.toFixed(2)} nm, ${spec.mode} at ${spec.wavelengthNm} nm, chip ${layer.monitor.chip})`;
  if (layer.monitor.cut === 'level') {
    const near = [...inside, ...(after ? [after] : [])]
      .map((p) => Math.abs(p.thicknessNm - t) / qwNm)
      .reduce((a, b) => Math.min(a, b), Infinity);
    if (Math.abs(slopePerNm) < PLAN_THRESHOLDS.flatSlopePerNm || near < PLAN_THRESHOLDS.nearTurningPointQw) {
      warnings.push({
        code: 'flat-level-cut',
        message:
          `${where}: level cut in a flat stretch (slope ${slopePerNm.toExponential(2)} per nm` +
          (Number.isFinite(near) ? `, ${(near * 100).toFixed(1)} % of a quarter-wave from a turning point)` : ')') +
          '; a small signal error moves the cut far (common practice: keep |slope| ≥ 0.001/nm and ≥ 10 % QW from a turning point)',
      });
    }
  } else if (!inside.some((p) => Math.abs(p.thicknessNm - t) <= endTolNm)) {
    const nearest = [...inside, ...(after ? [after] : [])].sort((a, b) => Math.abs(a.thicknessNm - t) - Math.abs(b.thicknessNm - t))[0];
    warnings.push({
      code: 'cut-not-at-turning-point',
      message:
        `${where}: turning-point cut, but the modelled signal does not turn at the layer's end` +
        (nearest ? ` (nearest turning point at ${nearest.thicknessNm.toFixed(2)} nm, ${((100 * (nearest.thicknessNm - t)) / qwNm).toFixed(1)} % QW away)` : ' (no turning point nearby)'),
    });
  }
  if (swingPct < PLAN_THRESHOLDS.minSwingPct) {
    warnings.push({
      code: 'small-swing',
      message: `${where}: the signal swings only ${swingPct.toFixed(2)} % over the layer (common practice: ≥ ${PLAN_THRESHOLDS.minSwingPct} % to monitor it)`,
    });
  }

  return {
    layer: layerNo,
    material: layer.material,
    wavelengthNm: spec.wavelengthNm,
    mode: spec.mode,
    chip: layer.monitor.chip,
    cut: layer.monitor.cut,
    thicknessNm: t,
    qwotAtMonitor: t / qwNm,
    turningPoints: inside.length,
    turningPointList: inside,
    nextTurningPoint: after,
    startSignal,
    cutSignal,
    swingPct,
    minSignal,
    maxSignal,
    slopePerNm,
    warnings,
  };
}

/** The monitoring plan of every layer (shared/FORMATS.md `plan`, plus the fields of PlanLayer). */
export function cutPlan(design: Design): PlanLayer[] {
  return design.layers.map((l) => planLayer(design, l.layer));
}
