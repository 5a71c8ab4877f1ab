/**
 * The warning for a cut whose error is beyond the shop's warning threshold. Where the error is
 * within twice its own σ of zero the readings do not establish that the cut was off (a thin level
 * cut's σ, or one that carries the lamp's allowed drift, runs to several % QWOT): the warning says
 * so, with the σ, so that an operator does not take a cut that may well have been on target for
 * one that missed. 2σ: the usual two-sided 95 % level (common practice).
 */
export function cutWarning(cutErrorQwotPct: number, sigmaQwotPct: number, warnPct: number, wavelengthNm: number): string | null {
  if (!(Math.abs(cutErrorQwotPct) > warnPct)) return null;
  const what = `cut ${cutErrorQwotPct > 0 ? 'thick (overshoot)' : 'thin (undershoot)'} by ${Math.abs(cutErrorQwotPct).toFixed(1)} % of a quarter-wave at ${wavelengthNm} nm`;
  if (!(sigmaQwotPct > 0) || Math.abs(cutErrorQwotPct) > 2 * sigmaQwotPct) return what;
  return `${what}, ± ${sigmaQwotPct.toFixed(1)} %: within 2σ of an on-target cut, so the readings do not establish the miss`;
}
