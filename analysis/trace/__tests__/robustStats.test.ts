import { describe, expect, it } from 'vitest';
import { median, medianInPlace } from '../robustStats';
import { gaussian } from './rng';

/** The median by its definition: the middle of the sorted values, or the mean of the middle two. */
function sortedMedian(values: ArrayLike<number>): number {
  const s = Array.from(values).sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 === 1 ? s[mid] : 0.5 * (s[mid - 1] + s[mid]);
}

describe('medianInPlace', () => {
  it('gives the middle of 1 … n, in any order (odd and even n; both sides of the sampled window at 2048 and of its kept scratch at 65 536)', () => {
    const g = gaussian(11);
    for (const n of [1, 2, 3, 15, 2047, 2048, 2049, 6701, 6702, 70_001]) {
      const a = Float64Array.from({ length: n }, (_, i) => i + 1);
      // a shuffle (Fisher–Yates)
      for (let i = n - 1; i > 0; i--) {
        const j = Math.floor(((g() + 10) * 1e6) % (i + 1));
        [a[i], a[j]] = [a[j], a[i]];
      }
      expect(medianInPlace(a)).toBe((n + 1) / 2);
    }
  });

  it('equals the sorted median on Gaussian, heavy-tailed, tied, sorted and stride-patterned data', () => {
    const g = gaussian(5);
    const n = 6700;
    const cases: Float64Array[] = [
      Float64Array.from({ length: n }, () => g()),
      Float64Array.from({ length: n + 1 }, () => g()),
      // spikes: 1 % at 50σ
      Float64Array.from({ length: n }, (_, i) => g() + (i % 97 === 0 ? 50 : 0)),
      // few distinct values: ties across the window's bounds (+ 0: no −0, equal to 0 but not to toBe)
      Float64Array.from({ length: n }, () => Math.round(g()) + 0),
      Float64Array.from({ length: 5000 }, () => 3),
      Float64Array.from({ length: n }, (_, i) => i * 0.001),
      Float64Array.from({ length: n }, (_, i) => -i),
      // large values on the sample's stride (n/256 = 26.17…), small elsewhere: the sample misleads
      Float64Array.from({ length: n }, (_, i) => (Math.floor((Math.floor(i / (n / 256)) * n) / 256) === i ? 1e6 + i : g())),
    ];
    for (const c of cases) {
      const want = sortedMedian(c);
      const got = medianInPlace(Float64Array.from(c));
      expect(got).toBe(want);
      expect(median(c)).toBe(want);
    }
  });

  it('keeps the values (reorders only) and gives NaN for none', () => {
    const g = gaussian(3);
    const a = Float64Array.from({ length: 4000 }, () => g());
    const b = Float64Array.from(a);
    medianInPlace(b);
    expect(Array.from(b).sort((x, y) => x - y)).toEqual(Array.from(a).sort((x, y) => x - y));
    expect(medianInPlace(new Float64Array(0))).toBeNaN();
  });
});
