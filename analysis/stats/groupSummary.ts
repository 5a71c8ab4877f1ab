export interface GroupSummary {
  count: number;
  mean: number;
  /** Sample standard deviation (n − 1); NaN under two values. */
  sd: number;
  /** Values outside tolerance (0 when no flags were given). */
  outOfTolerance: number;
}

/**
 * Mean and sample standard deviation by Welford's one-pass update (B. P. Welford,
 * Technometrics 4, 419–420, 1962), which keeps its accuracy when the mean is large against the
 * spread. `outside[i]` flags value i as out of tolerance. NaN values are refused: a missing
 * figure must be left out by the caller, not averaged in.
 */
export function groupSummary(values: ArrayLike<number>, outside?: ArrayLike<boolean>): GroupSummary {
  if (outside && outside.length !== values.length) throw new RangeError(`groupSummary: ${values.length} values but ${outside.length} tolerance flags`);
  let mean = 0;
  let m2 = 0;
  let out = 0;
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (!Number.isFinite(x)) throw new RangeError(`groupSummary: value ${i} is ${x}, not a finite number`);
    const delta = x - mean;
    mean += delta / (i + 1);
    m2 += delta * (x - mean);
    if (outside?.[i]) out++;
  }
  const n = values.length;
  return { count: n, mean: n ? mean : NaN, sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : NaN, outOfTolerance: out };
}

/** The share of a group's values out of tolerance, 0–1; NaN for an empty group. */
export function outOfToleranceShare(g: Pick<GroupSummary, 'count' | 'outOfTolerance'>): number {
  return g.count > 0 ? g.outOfTolerance / g.count : NaN;
}
