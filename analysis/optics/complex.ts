/** A complex number. Refractive indices follow N = n − ik (k ≥ 0 absorbs), so im = −k. */
export interface Complex {
  re: number;
  im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });

/** N = n − ik from the optical constants n and k. */
export const fromNK = (n: number, k = 0): Complex => ({ re: n, im: -k });

export const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
export const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
export const mul = (a: Complex, b: Complex): Complex => ({
  re: a.re * b.re - a.im * b.im,
  im: a.re * b.im + a.im * b.re,
});
export const scale = (a: Complex, s: number): Complex => ({ re: a.re * s, im: a.im * s });
export const abs2 = (a: Complex): number => a.re * a.re + a.im * a.im;
export const conj = (a: Complex): Complex => ({ re: a.re, im: -a.im });

/** Smith's algorithm: avoids overflow when |b| is very large or very small. */
export function div(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const den = b.re + b.im * r;
    return { re: (a.re + a.im * r) / den, im: (a.im - a.re * r) / den };
  }
  const r = b.re / b.im;
  const den = b.re * r + b.im;
  return { re: (a.re * r + a.im) / den, im: (a.im * r - a.re) / den };
}

/**
 * Principal square root (re ≥ 0). The half-angle form takes the smaller part as im/(2·re)
 * rather than √((|a| ∓ re)/2), which cancels catastrophically for nearly real arguments
 * (a weakly absorbing layer's N² − n0²sin²θ0 would lose its k entirely).
 */
export function sqrt(a: Complex): Complex {
  const m = Math.hypot(a.re, a.im);
  if (m === 0) return { re: 0, im: 0 };
  if (a.re >= 0) {
    const re = Math.sqrt((m + a.re) / 2);
    return { re, im: a.im / (2 * re) };
  }
  const t = Math.sqrt((m - a.re) / 2);
  return { re: Math.abs(a.im) / (2 * t), im: a.im < 0 ? -t : t };
}

/** cos z = cos x cosh y − i sin x sinh y. */
export const cos = (z: Complex): Complex => ({
  re: Math.cos(z.re) * Math.cosh(z.im),
  im: -Math.sin(z.re) * Math.sinh(z.im),
});

/** sin z = sin x cosh y + i cos x sinh y. */
export const sin = (z: Complex): Complex => ({
  re: Math.sin(z.re) * Math.cosh(z.im),
  im: Math.cos(z.re) * Math.sinh(z.im),
});

export const arg = (a: Complex): number => Math.atan2(a.im, a.re);
