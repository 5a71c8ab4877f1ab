/** A seeded pseudo-random source: uniform in [0, 1) and standard normal. */
export interface Rng {
  uniform(): number;
  normal(): number;
}

/**
 * mulberry32 (Tommy Ettinger's 32-bit generator; from memory) with Box–Muller normals
 * (G. E. P. Box, M. E. Muller, Ann. Math. Statist. 29, 610 (1958)).
 */
export function createRng(seed: number): Rng {
  let a = seed >>> 0;
  let spare: number | null = null;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}
