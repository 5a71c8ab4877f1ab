/**
 * The simulator's own seeded random source (shares nothing with analysis/synth):
 * sfc32, Chris Doty-Humphrey's "small fast counting" generator from PractRand (from memory),
 * seeded through splitmix32 (from memory), with normals by Marsaglia's polar method
 * (G. Marsaglia, T. A. Bray, SIAM Review 6, 260 (1964)).
 */
export interface ChamberRng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [a, b). */
  between(a: number, b: number): number;
  /** Standard normal. */
  gauss(): number;
  /** An independent generator for one job, so switching one effect off leaves the others' draws unchanged. */
  fork(label: string): ChamberRng;
}

function splitmix32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
}

function hashLabel(label: string): number {
  let h = 0x811c9dc5; // FNV-1a, 32 bit (from memory)
  for (let i = 0; i < label.length; i++) h = Math.imul(h ^ label.charCodeAt(i), 0x01000193);
  return h >>> 0;
}

export function chamberRng(seed: number): ChamberRng {
  const init = splitmix32(seed);
  let a = init(), b = init(), c = init(), d = 1;
  const u32 = (): number => {
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = ((c << 21) | (c >>> 11)) >>> 0;
    c = (c + t) >>> 0;
    return t;
  };
  for (let i = 0; i < 12; i++) u32();
  let spare = NaN;
  const next = () => u32() / 4294967296;
  const gauss = (): number => {
    if (!Number.isNaN(spare)) {
      const s = spare;
      spare = NaN;
      return s;
    }
    let x: number, y: number, s: number;
    do {
      x = 2 * next() - 1;
      y = 2 * next() - 1;
      s = x * x + y * y;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    spare = y * f;
    return x * f;
  };
  return {
    next,
    between: (lo, hi) => lo + (hi - lo) * next(),
    gauss,
    fork: (label) => chamberRng((seed ^ hashLabel(label)) >>> 0),
  };
}
