import { indexAt } from '../materials';
import { wavelengthGrid } from './designSpectrum';
import { type Design } from './parseDesign';

export interface SpectrumRange {
  fromNm: number;
  toNm: number;
  stepNm: number;
  /** Where the range was cut short: the first material that bounds it and why (indexAt's words). */
  limitedBy?: string;
}

/**
 * The longest stretch of a spectrum's wavelength grid on which every material of the design (its
 * ambient, substrate and layers' materials) has an index: a measured table covers only its own
 * wavelengths, a Sellmeier model fails near a resonance. Null where no grid point has them all.
 */
export function spectrumRange(design: Design, range: { fromNm: number; toNm: number; stepNm: number }): SpectrumRange | null {
  const used = new Set(design.layers.map((l) => l.material));
  const models: [string, Design['ambient']][] = [['the ambient', design.ambient], ['the substrate', design.substrate], ...[...used].map((m) => [`material "${m}"`, design.materials[m]] as [string, Design['ambient']])];
  const grid = wavelengthGrid(range.fromNm, range.toNm, range.stepNm);
  let best: [number, number] | null = null;
  let start = -1;
  let limitedBy: string | undefined;
  for (let i = 0; i <= grid.length; i++) {
    let fault: string | null = i === grid.length ? '' : null;
    for (const [name, model] of i < grid.length ? models : []) {
      try {
        indexAt(model, grid[i]);
      } catch (e) {
        fault = `${name}: ${(e as Error).message}`;
        break;
      }
    }
    if (fault === null) {
      if (start < 0) start = i;
      continue;
    }
    if (fault) limitedBy ??= fault;
    if (start >= 0 && (!best || i - start > best[1] - best[0])) best = [start, i];
    start = -1;
  }
  if (!best) return null;
  const out = { fromNm: grid[best[0]], toNm: grid[best[1] - 1], stepNm: range.stepNm };
  return best[0] === 0 && best[1] === grid.length ? out : { ...out, limitedBy };
}
