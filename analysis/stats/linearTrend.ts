export interface LinearTrend {
  slope: number;
  /** 1σ of the slope, s/√Sxx with s² = SSR/(n − 2); NaN for fewer than three points. */
  slopeSigma: number;
  intercept: number;
  interceptSigma: number;
  count: number;
  residualRms: number;
}

/**
 * Ordinary least-squares line y = intercept + slope·x, in centred form for accuracy
 * (standard formulas, e.g. N. R. Draper, H. Smith, Applied Regression Analysis, ch. 1).
 */
export function linearTrend(x: ArrayLike<number>, y: ArrayLike<number>): LinearTrend {
  const n = x.length;
  if (y.length !== n) throw new RangeError(`linearTrend: x has ${n} values, y has ${y.length}`);
  if (n === 0) return { slope: NaN, slopeSigma: NaN, intercept: NaN, interceptSigma: NaN, count: 0, residualRms: NaN };
  let mx = 0, my = 0;
  for (let i = 0; i < n; i++) {
    mx += (x[i] - mx) / (i + 1);
    my += (y[i] - my) / (i + 1);
  }
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (n === 1 || sxx === 0) {
    return { slope: NaN, slopeSigma: NaN, intercept: my, interceptSigma: NaN, count: n, residualRms: NaN };
  }
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let ssr = 0;
  for (let i = 0; i < n; i++) ssr += (y[i] - intercept - slope * x[i]) ** 2;
  const s2 = n > 2 ? ssr / (n - 2) : NaN;
  return {
    slope,
    slopeSigma: Math.sqrt(s2 / sxx),
    intercept,
    interceptSigma: Math.sqrt(s2 * (1 / n + (mx * mx) / sxx)),
    count: n,
    residualRms: Math.sqrt(ssr / n),
  };
}
