/**
 * The simulator's own thin-film optics at normal incidence: the characteristic matrix of each
 * layer and the response of the whole assembly, after H. A. Macleod, "Thin-Film Optical Filters"
 * (4th ed., CRC 2010), ch. 2: for a layer of index N = n − ik and thickness d,
 * δ = 2πNd/λ and M = [[cos δ, i sin δ/η], [iη sin δ, cos δ]] with η = N (free-space units);
 * [B, C]ᵀ = M_top ⋯ M_1 [1, η_s]ᵀ, r = (η₀B − C)/(η₀B + C), T = 4η₀Re(η_s)/|η₀B + C|².
 * A thick substrate's bare back face is added incoherently (intensities), Macleod §2.x
 * "thick substrate" (from memory of the section number).
 * Matrices are Float64Array(8): m11, m12, m21, m22 as (re, im) pairs.
 */
export type Mat = Float64Array;

export const identity = (): Mat => Float64Array.of(1, 0, 0, 0, 0, 0, 1, 0);

/** Characteristic matrix of one homogeneous layer into `out`. */
export function layerMatrix(n: number, k: number, thicknessNm: number, wavelengthNm: number, out: Mat = new Float64Array(8)): Mat {
  const a = (2 * Math.PI * n * thicknessNm) / wavelengthNm;
  const b = (2 * Math.PI * k * thicknessNm) / wavelengthNm;
  // δ = a − ib: cos δ = cos a cosh b + i sin a sinh b; sin δ = sin a cosh b − i cos a sinh b
  const ca = Math.cos(a), sa = Math.sin(a);
  const ch = b === 0 ? 1 : Math.cosh(b), sh = b === 0 ? 0 : Math.sinh(b);
  const cr = ca * ch, ci = sa * sh;
  const sr = sa * ch, si = -ca * sh;
  // i·sin δ = (−si) + i·sr
  const isr = -si, isi = sr;
  // i sin δ / η with η = n − ik: divide by (n − ik) = multiply by (n + ik)/(n² + k²)
  const q = n * n + k * k;
  out[0] = cr; out[1] = ci;
  out[2] = (isr * n - isi * k) / q; out[3] = (isr * k + isi * n) / q;
  // iη sin δ = (isr + i·isi)(n − ik)
  out[4] = isr * n + isi * k; out[5] = isi * n - isr * k;
  out[6] = cr; out[7] = ci;
  return out;
}

/** out = a·b (out may alias neither). */
export function mul(a: Mat, b: Mat, out: Mat): Mat {
  const a11r = a[0], a11i = a[1], a12r = a[2], a12i = a[3], a21r = a[4], a21i = a[5], a22r = a[6], a22i = a[7];
  const b11r = b[0], b11i = b[1], b12r = b[2], b12i = b[3], b21r = b[4], b21i = b[5], b22r = b[6], b22i = b[7];
  out[0] = a11r * b11r - a11i * b11i + a12r * b21r - a12i * b21i;
  out[1] = a11r * b11i + a11i * b11r + a12r * b21i + a12i * b21r;
  out[2] = a11r * b12r - a11i * b12i + a12r * b22r - a12i * b22i;
  out[3] = a11r * b12i + a11i * b12r + a12r * b22i + a12i * b22r;
  out[4] = a21r * b11r - a21i * b11i + a22r * b21r - a22i * b21i;
  out[5] = a21r * b11i + a21i * b11r + a22r * b21i + a22i * b21r;
  out[6] = a21r * b12r - a21i * b12i + a22r * b22r - a22i * b22i;
  out[7] = a21r * b12i + a21i * b12r + a22r * b22i + a22i * b22r;
  return out;
}

export interface FilmLayer {
  n: number;
  k: number;
  thicknessNm: number;
}

/** Forward product M_top ⋯ M_1 and reverse product M_1 ⋯ M_top of layers in deposition order. */
export function stackMatrices(layers: readonly FilmLayer[], wavelengthNm: number): { forward: Mat; reverse: Mat } {
  let forward = identity(), reverse = identity();
  const m = new Float64Array(8);
  for (const l of layers) {
    layerMatrix(l.n, l.k, l.thicknessNm, wavelengthNm, m);
    forward = mul(m, forward, new Float64Array(8));
    reverse = mul(reverse, m, new Float64Array(8));
  }
  return { forward, reverse };
}

/** |(ηa·B − C)/(ηa·B + C)|² and |ηa·B + C|² for [B, C] = M·[1, ηb], real ηa, complex ηb. */
function reflect(m: Mat, etaA: number, ebR: number, ebI: number): { r2: number; d2: number } {
  const bR = m[0] + m[2] * ebR - m[3] * ebI, bI = m[1] + m[2] * ebI + m[3] * ebR;
  const cR = m[4] + m[6] * ebR - m[7] * ebI, cI = m[5] + m[6] * ebI + m[7] * ebR;
  const numR = etaA * bR - cR, numI = etaA * bI - cI;
  const denR = etaA * bR + cR, denI = etaA * bI + cI;
  const d2 = denR * denR + denI * denI;
  return { r2: (numR * numR + numI * numI) / d2, d2 };
}

export interface Media {
  /** Ambient index (real). */
  ambient: number;
  /** Substrate index (its k is ignored: a witness chip is clear). */
  substrate: number;
  /** Thick substrate with a bare back face, added incoherently. */
  backside: boolean;
}

/**
 * R and T of the assembly (light from the ambient). `reverse` is needed only with a backside.
 * Backside: T = T_f·T_b/(1 − R'_f·R_b), R = R_f + T_f²·R_b/(1 − R'_f·R_b), R'_f the stack's
 * reflectance seen from inside the substrate, R_b = ((n_s − n₀)/(n_s + n₀))².
 */
export function response(forward: Mat, reverse: Mat | null, media: Media): { R: number; T: number } {
  const n0 = media.ambient, ns = media.substrate;
  const front = reflect(forward, n0, ns, 0);
  const Rf = front.r2;
  const Tf = (4 * n0 * ns) / front.d2;
  if (!media.backside) return { R: Rf, T: Tf };
  if (!reverse) throw new TypeError('chamber simulator: a backside needs the reverse product');
  const Rs = reflect(reverse, ns, n0, 0).r2;
  const Rb = ((ns - n0) / (ns + n0)) ** 2;
  const den = 1 - Rs * Rb;
  return { R: Rf + (Tf * Tf * Rb) / den, T: (Tf * (1 - Rb)) / den };
}

/** R and T of layers (deposition order) on a substrate, light from the ambient: for tests elsewhere that want an independent evaluation. */
export function stackRT(layers: readonly FilmLayer[], wavelengthNm: number, media: Media): { R: number; T: number } {
  const m = stackMatrices(layers, wavelengthNm);
  return response(m.forward, m.reverse, media);
}
