import { indexAt } from './indexAt';
import { type MaterialModel } from './schema';

/**
 * The model moved so its real index at `wavelengthNm` becomes `n`, its dispersion kept: a
 * constant model takes n; Cauchy shifts A; a table shifts every n. A Sellmeier model has no
 * additive term, so moving it is refused (a constant would lose its dispersion).
 * @throws RangeError when the model cannot be moved that way, or n is not a finite number > 0.
 */
export function adoptIndex(model: MaterialModel, wavelengthNm: number, n: number): MaterialModel {
  if (!(Number.isFinite(n) && n > 0)) throw new RangeError(`index must be a finite number > 0 (got ${n})`);
  const shift = n - indexAt(model, wavelengthNm).re;
  switch (model.model) {
    case 'constant':
      return { ...model, n };
    case 'cauchy':
      return { ...model, A: model.A + shift };
    case 'table': {
      const points = model.points.map(([wl, pn, k]) => [wl, pn + shift, k] as [number, number, number]);
      if (points.some((p) => !(p[1] > 0))) throw new RangeError('the shifted table would have an index ≤ 0');
      return { ...model, points };
    }
    case 'sellmeier':
      throw new RangeError('a Sellmeier model has no additive term to move; enter the new coefficients by hand or use a Cauchy model');
  }
}
