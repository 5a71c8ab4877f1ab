import { type Complex } from './complex';
import { assemblyMatrix, type LayerAt } from './assembly';
import { expm1Small } from './expm1Small';
import { sinCos, sinCosOut } from './sinCos';
import { assertTransparentIncidence } from './stackResponse';
import { tilt, type Polarization } from './tilt';

/** A layer growing on a witness chip whose earlier layers are already deposited. */
export interface GrowingLayer {
  ambient: Complex;
  substrate: Complex;
  /** Layers already on the chip, deposition order. */
  below: readonly LayerAt[];
  /** Index of the growing layer at the monitor wavelength. */
  growing: Complex;
  wavelengthNm: number;
  mode: 'R' | 'T';
  /** @default false */
  backside?: boolean;
  /** @default 0 */
  angleDeg?: number;
  /** @default 'mean' */
  pol?: Polarization | 'mean';
}

/**
 * cos δ and sin δ of the growing layer's phase thickness δ = k·N·cos θ·d at each point: written
 * by one call (`fill`), read by later ones on the same growing layer at the same thicknesses,
 * where only the stack below changed (a Jacobian's differences in the layers below): the same
 * values, not computed again.
 */
export interface PhaseCache {
  cos: Float64Array;
  sin: Float64Array;
  fill: boolean;
}

/**
 * The monitor signal (R or T as a fraction) against the growing layer's physical thickness.
 * The stack below is folded into one matrix once (and with the substrate into one vector); each
 * thickness point then costs one layer matrix and two matrix–vector products, with no allocation.
 */
export function growingLayerSignal(
  spec: GrowingLayer,
  thicknessNm: ArrayLike<number>,
  out: Float64Array = new Float64Array(thicknessNm.length),
  /** One polarization or normal incidence only (ignored otherwise). */
  phase?: PhaseCache,
): Float64Array {
  assertTransparentIncidence(spec.ambient, 'ambient');
  if (spec.backside) assertTransparentIncidence(spec.substrate, 'substrate');
  const pol = spec.pol ?? 'mean';
  const d = float64(thicknessNm);
  if (pol !== 'mean') {
    signalLoop(setUp(spec, pol), d, out, 1, true, phase);
    return out;
  }
  // At normal incidence s and p coincide (η_p = N²/N = η_s).
  if ((spec.angleDeg ?? 0) === 0) {
    signalLoop(setUp(spec, 's'), d, out, 1, true, phase);
    return out;
  }
  accumulate(spec, 's', d, out, 0.5, true);
  accumulate(spec, 'p', d, out, 0.5, false);
  return out;
}

/**
 * The thicknesses as a Float64Array (the same numbers): signalLoop's optimised code is made for
 * the one kind of array it has read, and a plain array (a caller's single point or grid) after
 * typed ones sent it back to the interpreter, where every number it computes is a new object.
 */
function float64(thicknessNm: ArrayLike<number>): Float64Array {
  return thicknessNm instanceof Float64Array ? thicknessNm : Float64Array.from(thicknessNm);
}

/**
 * growingLayerSignal for many thickness series on one spec (a grid search at one index): the
 * media, the stack below and the growing layer are set up once. Normal incidence or one
 * polarization (pol other than 'mean'); the same figures as growingLayerSignal.
 */
export function growingLayerSignalFor(spec: GrowingLayer): (thicknessNm: ArrayLike<number>, out: Float64Array) => Float64Array {
  assertTransparentIncidence(spec.ambient, 'ambient');
  if (spec.backside) assertTransparentIncidence(spec.substrate, 'substrate');
  const pol = spec.pol ?? 'mean';
  if (pol === 'mean' && (spec.angleDeg ?? 0) !== 0) throw new RangeError('growingLayerSignalFor: one polarization or normal incidence');
  const c = setUp(spec, pol === 'mean' ? 's' : pol);
  return (thicknessNm, out) => {
    signalLoop(c, float64(thicknessNm), out, 1, true);
    return out;
  };
}

function accumulate(
  spec: GrowingLayer,
  pol: Polarization,
  thicknessNm: Float64Array,
  out: Float64Array,
  weight: number,
  overwrite: boolean,
): void {
  signalLoop(setUp(spec, pol), thicknessNm, out, weight, overwrite);
}

type SetUp = ReturnType<typeof setUp>;

/** setUp's matrix of the stack below, read into numbers there at once (kept: one array a thread, not one a call). */
const BELOW = new Float64Array(8);

/** What every thickness point of one spec shares. */
function setUp(spec: GrowingLayer, pol: Polarization) {
  const invariant = spec.ambient.re * Math.sin(((spec.angleDeg ?? 0) * Math.PI) / 180);
  const e0 = tilt(spec.ambient, invariant, pol).eta;
  const es = tilt(spec.substrate, invariant, pol).eta;
  const g = tilt(spec.growing, invariant, pol);
  const mb = assemblyMatrix(spec.below, spec.wavelengthNm, invariant, pol, BELOW);
  const b11r = mb[0], b11i = mb[1], b12r = mb[2], b12i = mb[3], b21r = mb[4], b21i = mb[5], b22r = mb[6], b22i = mb[7];
  // Front view: [B, C] = L·(Mb·[1, ηs]); the stack below and the substrate fold into one vector.
  const vbr = b11r + b12r * es.re - b12i * es.im, vbi = b11i + b12r * es.im + b12i * es.re;
  const vcr = b21r + b22r * es.re - b22i * es.im, vci = b21i + b22r * es.im + b22i * es.re;
  const k = (2 * Math.PI) / spec.wavelengthNm;
  const ger = g.eta.re, gei = g.eta.im;
  const etaDen = ger * ger + gei * gei;
  const wantR = spec.mode === 'R';
  const backside = spec.backside ?? false;
  const e0r = e0.re, e0i = e0.im, esr = es.re, esi = es.im;
  // Bare back face seen from inside the substrate (Fresnel), for the incoherent sum.
  const rbNumR = es.re - e0.re, rbNumI = es.im - e0.im;
  const rbDenR = es.re + e0.re, rbDenI = es.im + e0.im;
  const rBack = (rbNumR * rbNumR + rbNumI * rbNumI) / (rbDenR * rbDenR + rbDenI * rbDenI);
  const tBack = 1 - rBack;
  const kr = g.nCos.re * k, ki = g.nCos.im * k;
  // A transparent growing layer (real δ and η, the usual case): the terms that vanish are left
  // out; the figures are the same, operation for operation.
  const transparent = ki === 0 && gei === 0;
  // With no absorption anywhere (real admittances, a stack below of the lossless form
  // [[a, ib], [ic, d]]), the coated face reflects alike from both sides (R + T = 1 on each side,
  // T the same both ways; Macleod, Thin-Film Optical Filters, ch. 2, from memory): the reversed
  // product for the light coming back through the substrate is not needed.
  const lossless = transparent && e0i === 0 && esi === 0 && b11i === 0 && b22i === 0 && b12r === 0 && b21r === 0;
  return {
    b11r, b11i, b12r, b12i, b21r, b21i, b22r, b22i, vbr, vbi, vcr, vci, ger, gei, etaDen, wantR, backside,
    e0r, e0i, esr, esi, rBack, tBack, kr, ki, transparent, lossless,
  };
}

function signalLoop(c: SetUp, thicknessNm: Float64Array, out: Float64Array, weight: number, overwrite: boolean, phase?: PhaseCache): void {
  const { b11r, b11i, b12r, b12i, b21r, b21i, b22r, b22i, vbr, vbi, vcr, vci, ger, gei, etaDen, wantR, backside } = c;
  const { e0r, e0i, esr, esi, rBack, tBack, kr, ki, transparent, lossless } = c;
  const cosIn = phase && !phase.fill ? phase.cos : null, sinIn = phase && !phase.fill ? phase.sin : null;
  const cosOut = phase && phase.fill ? phase.cos : null, sinOut = phase && phase.fill ? phase.sin : null;
  for (let i = 0; i < thicknessNm.length; i++) {
    let cd: number, sd: number;
    if (cosIn && sinIn) {
      cd = cosIn[i];
      sd = sinIn[i];
    } else {
      // (both from one argument reduction: optics/sinCos.ts)
      sinCos(kr * thicknessNm[i]);
      cd = sinCosOut.cos;
      sd = sinCosOut.sin;
      if (cosOut && sinOut) {
        cosOut[i] = cd;
        sinOut[i] = sd;
      }
    }
    let cr: number, ci: number, l12r: number, l12i: number, l21r: number, l21i: number;
    let Br: number, Bi: number, Cr: number, Ci: number;
    if (transparent) {
      cr = cd;
      ci = 0;
      l12r = 0;
      l12i = (sd * ger) / etaDen;
      l21r = 0;
      l21i = sd * ger;
      Br = cd * vbr - l12i * vci;
      Bi = cd * vbi + l12i * vcr;
      Cr = cd * vcr - l21i * vbi;
      Ci = l21i * vbr + cd * vci;
    } else {
      // cosh and sinh from one expm1, accurate for the small di of weak absorbers
      const em = expm1Small(ki * thicknessNm[i]);
      const emInv = -em / (1 + em);
      const sh = (em - emInv) / 2, ch = 1 + (em + emInv) / 2;
      // L = [[cos δ, i sin δ/η], [i η sin δ, cos δ]] (Macleod eq. 2.106)
      cr = cd * ch;
      ci = -sd * sh;
      const isr = -cd * sh, isi = sd * ch;
      l12r = (isr * ger + isi * gei) / etaDen;
      l12i = (isi * ger - isr * gei) / etaDen;
      l21r = isr * ger - isi * gei;
      l21i = isr * gei + isi * ger;
      Br = cr * vbr - ci * vbi + l12r * vcr - l12i * vci;
      Bi = cr * vbi + ci * vbr + l12r * vci + l12i * vcr;
      Cr = l21r * vbr - l21i * vbi + cr * vcr - ci * vci;
      Ci = l21r * vbi + l21i * vbr + cr * vci + ci * vcr;
    }
    const sumR = e0r * Br - e0i * Bi + Cr, sumI = e0r * Bi + e0i * Br + Ci;
    const den = sumR * sumR + sumI * sumI;
    let value: number;
    if (!backside && !wantR) {
      value = (4 * e0r * esr) / den;
    } else if (!backside) {
      const difR = e0r * Br - e0i * Bi - Cr, difI = e0r * Bi + e0i * Br - Ci;
      value = (difR * difR + difI * difI) / den;
    } else if (lossless) {
      const difR = e0r * Br - e0i * Bi - Cr, difI = e0r * Bi + e0i * Br - Ci;
      const Rf = (difR * difR + difI * difI) / den;
      const Tf = (4 * e0r * esr) / den;
      const denom = 1 - Rf * rBack;
      value = wantR ? Rf + (Tf * Tf * rBack) / denom : (Tf * tBack) / denom;
    } else {
      const difR = e0r * Br - e0i * Bi - Cr, difI = e0r * Bi + e0i * Br - Ci;
      const Rf = (difR * difR + difI * difI) / den;
      const Tf = (4 * e0r * esr) / den;
      // Coated face seen from inside: the reversed product Mb_rev·L with Mb_rev = [[b22, b12], [b21, b11]]
      // (see coherent.ts), applied to [1, η0]: w = L·[1, η0], then [B2, C2] = Mb_rev·w.
      const w1r = cr + l12r * e0r - l12i * e0i, w1i = ci + l12r * e0i + l12i * e0r;
      const w2r = l21r + cr * e0r - ci * e0i, w2i = l21i + cr * e0i + ci * e0r;
      const B2r = b22r * w1r - b22i * w1i + b12r * w2r - b12i * w2i, B2i = b22r * w1i + b22i * w1r + b12r * w2i + b12i * w2r;
      const C2r = b21r * w1r - b21i * w1i + b11r * w2r - b11i * w2i, C2i = b21r * w1i + b21i * w1r + b11r * w2i + b11i * w2r;
      const s2r = esr * B2r - esi * B2i + C2r, s2i = esr * B2i + esi * B2r + C2i;
      const d2r = esr * B2r - esi * B2i - C2r, d2i = esr * B2i + esi * B2r - C2i;
      const Rin = (d2r * d2r + d2i * d2i) / (s2r * s2r + s2i * s2i);
      const denom = 1 - Rin * rBack;
      value = wantR ? Rf + (Tf * Tf * rBack) / denom : (Tf * tBack) / denom;
    }
    out[i] = overwrite ? weight * value : out[i] + weight * value;
  }
}
