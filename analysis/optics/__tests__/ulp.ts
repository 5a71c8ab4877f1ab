/** One unit in the last place of v (binary64): the optics tests' measure of a kernel against the engine's own function. */
export function ulp(v: number): number {
  const a = Math.abs(v);
  return a === 0 ? Number.MIN_VALUE : 2 ** (Math.floor(Math.log2(a)) - 52);
}
