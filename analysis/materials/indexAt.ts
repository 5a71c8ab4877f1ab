import { type Complex, fromNK } from '../optics/complex';
import { type MaterialModel } from './schema';

/** The wavelength range a model may be evaluated in, nm (a table's own range bounds it too). */
export function validRangeNm(model: MaterialModel): { fromNm: number; toNm: number } {
  let fromNm = model.validFromNm ?? 0;
  let toNm = model.validToNm ?? Number.POSITIVE_INFINITY;
  if (model.model === 'table') {
    fromNm = Math.max(fromNm, model.points[0][0]);
    toNm = Math.min(toNm, model.points[model.points.length - 1][0]);
  }
  return { fromNm, toNm };
}

/**
 * Complex index N = n − ik of a material model at one wavelength.
 * @throws RangeError outside the model's valid range, or where a Sellmeier model gives n² ≤ 0.
 */
export function indexAt(model: MaterialModel, wavelengthNm: number): Complex {
  if (!(wavelengthNm > 0) || !Number.isFinite(wavelengthNm)) {
    throw new RangeError(`wavelength must be a finite number > 0 nm (got ${wavelengthNm})`);
  }
  const { fromNm, toNm } = validRangeNm(model);
  if (wavelengthNm < fromNm || wavelengthNm > toNm) {
    throw new RangeError(`wavelength ${wavelengthNm} nm is outside the material's valid range ${fromNm}–${toNm} nm`);
  }
  const um = wavelengthNm / 1000;
  switch (model.model) {
    case 'constant':
      return fromNK(model.n, model.k ?? 0);
    case 'cauchy': {
      const l2 = um * um;
      return fromNK(model.A + model.B / l2 + (model.C ?? 0) / (l2 * l2), model.k ?? 0);
    }
    case 'sellmeier': {
      const l2 = um * um;
      let n2 = 1;
      for (let i = 0; i < model.B.length; i++) n2 += (model.B[i] * l2) / (l2 - model.C[i] * model.C[i]);
      // (at the resonance itself the sum is infinite: no index there either)
      if (!(n2 > 0) || !Number.isFinite(n2)) {
        throw new RangeError(`Sellmeier model gives n² = ${Number(n2.toPrecision(4))} at ${wavelengthNm} nm (too close to a resonance)`);
      }
      return fromNK(Math.sqrt(n2), 0);
    }
    case 'table': {
      const p = model.points;
      let lo = 0;
      let hi = p.length - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (p[mid][0] <= wavelengthNm) lo = mid;
        else hi = mid;
      }
      const f = (wavelengthNm - p[lo][0]) / (p[hi][0] - p[lo][0]);
      return fromNK(p[lo][1] + f * (p[hi][1] - p[lo][1]), p[lo][2] + f * (p[hi][2] - p[lo][2]));
    }
  }
}

/**
 * indexAt for one model as a function of the wavelength, each wavelength's value computed once
 * (a layer's fits ask for the same few wavelengths many times): the same values.
 */
export function indexAtMemo(model: MaterialModel): (wavelengthNm: number) => Complex {
  const memo = new Map<number, Complex>();
  return (w) => {
    let v = memo.get(w);
    if (!v) memo.set(w, (v = indexAt(model, w)));
    return v;
  };
}
