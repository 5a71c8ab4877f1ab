/** The Western Electric rules as the NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2 lists them. */
export const RUN_RULES = [
  { rule: 1, text: 'one point beyond 3σ' },
  { rule: 2, text: '2 of 3 consecutive points beyond 2σ, same side' },
  { rule: 3, text: '4 of 5 consecutive points beyond 1σ, same side' },
  { rule: 4, text: '8 consecutive points on one side of the centre line' },
] as const;

export const RUN_RULES_SOURCE = 'Western Electric rules (Western Electric Statistical Quality Control Handbook, 1956), as listed in the NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2';

export type RuleNumber = 1 | 2 | 3 | 4;

export interface RuleSignal {
  rule: RuleNumber;
  /** The point that completes the pattern. */
  index: number;
  /** Every point of the pattern (those beyond the zone, or the whole run for rule 4). */
  points: number[];
  side: 'above' | 'below';
}

/**
 * Signals of the four Western Electric rules on a series, zones in units of σ around `center`.
 * A pattern is reported at each point that completes it (so a long run of rule 4 signals at
 * its 8th point and every point after), which is how a chart marks them as they arrive.
 */
export function runRules(values: ArrayLike<number>, center: number, sigma: number): RuleSignal[] {
  if (!(sigma > 0)) throw new RangeError(`runRules: sigma must be > 0 (got ${sigma})`);
  const z = Array.from(values, (v) => (v - center) / sigma);
  const out: RuleSignal[] = [];
  const windowed = (rule: RuleNumber, size: number, need: number, beyond: number) => {
    for (let i = size - 1; i < z.length; i++) {
      for (const sign of [1, -1] as const) {
        if (!(sign * z[i] > beyond)) continue; // the completing point is itself in the zone
        const points: number[] = [];
        for (let j = i - size + 1; j <= i; j++) if (sign * z[j] > beyond) points.push(j);
        if (points.length >= need) out.push({ rule, index: i, points, side: sign > 0 ? 'above' : 'below' });
      }
    }
  };
  for (let i = 0; i < z.length; i++) {
    if (Math.abs(z[i]) > 3) out.push({ rule: 1, index: i, points: [i], side: z[i] > 0 ? 'above' : 'below' });
  }
  windowed(2, 3, 2, 2);
  windowed(3, 5, 4, 1);
  for (let i = 7; i < z.length; i++) {
    const run = z.slice(i - 7, i + 1);
    for (const sign of [1, -1] as const) {
      if (run.every((v) => sign * v > 0)) out.push({ rule: 4, index: i, points: Array.from({ length: 8 }, (_, k) => i - 7 + k), side: sign > 0 ? 'above' : 'below' });
    }
  }
  return out.sort((a, b) => a.index - b.index || a.rule - b.rule);
}
