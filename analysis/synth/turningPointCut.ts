/** Grid steps per quarter-wave over the search window, before the parabola's refinement. */
const STEPS_PER_QUARTER_WAVE = 400;

/**
 * The thickness where `signal` (the monitor reading as a function of the growing layer's physical
 * thickness, on the true stack below and the true index) has its extreme nearest `designNm`, within
 * half a quarter-wave (`quarterWaveNm`, physical) of it: the turning point a turning-point
 * controller watches for. Found on a grid and refined by the parabola through the grid's extreme
 * and its neighbours. Null where the signal does not turn in that window (a flat or monotonic
 * stretch: the controller would have nothing to cut on).
 */
export function turningPointNearNm(signal: (thicknessNm: number[]) => ArrayLike<number>, designNm: number, quarterWaveNm: number): number | null {
  const h = quarterWaveNm / STEPS_PER_QUARTER_WAVE;
  const lo = Math.max(h, designNm - quarterWaveNm / 2);
  const count = Math.floor((designNm + quarterWaveNm / 2 - lo) / h) + 1;
  const d = Array.from({ length: count }, (_, i) => lo + i * h);
  const s = signal(d);
  let best: number | null = null;
  for (let i = 1; i + 1 < count; i++) {
    const rise = s[i] - s[i - 1], fall = s[i + 1] - s[i];
    // an extreme at i: the differences change sign there (a flat pair counts on its first sample)
    if (!(rise > 0 && fall <= 0) && !(rise < 0 && fall >= 0)) continue;
    const curvature = s[i + 1] - 2 * s[i] + s[i - 1];
    const x = curvature !== 0 ? d[i] - (h * (s[i + 1] - s[i - 1])) / (2 * curvature) : d[i];
    if (best === null || Math.abs(x - designNm) < Math.abs(best - designNm)) best = x;
  }
  return best;
}
