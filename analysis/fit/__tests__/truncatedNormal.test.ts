import { describe, expect, it } from 'vitest';
import { truncatedNormal, populationPosterior } from '../truncatedNormal';
import { truncatedNormalMoments } from '../cutPastTurningPoint';
import { growthPosterior } from '../growthPosterior';

describe('the normal cut to an interval, in closed form', () => {
  it('the half-normal: mean √(2/π), variance 1 − 2/π (Johnson, Kotz, Balakrishnan vol. 1 ch. 13)', () => {
    const t = truncatedNormal(0, 1, 0, Infinity);
    expect(t.mean).toBeCloseTo(Math.sqrt(2 / Math.PI), 6);
    expect(t.sigma ** 2).toBeCloseTo(1 - 2 / Math.PI, 6);
    expect(t.logMass).toBeCloseTo(Math.log(0.5), 6);
  });

  it('agrees with Simpson\'s rule on the density (cutPastTurningPoint.truncatedNormalMoments) in the body and both tails', () => {
    for (const [m, v, lo, hi] of [[0.3, 1, 0, 2], [-2, 0.7, 0, 3], [5, 1, 0, 2], [-4, 0.5, 0, 1], [1, 0.2, 0.5, 0.9], [-5, 1, 0, 2]]) {
      const t = truncatedNormal(m, v, lo, hi), r = truncatedNormalMoments(m, v, lo, hi);
      expect(t.mean, `${m} ${v}`).toBeCloseTo(r.mean, 5);
      expect(t.sigma, `${m} ${v}`).toBeCloseTo(r.sigma, 5);
    }
  });

  it('far below the cut: an exponential of rate |m|/v² from 0, its log mass that of the tail', () => {
    // 1 − Φ(30) ≈ φ(30)/30·(1 − 1/900) (the Mills ratio's asymptotic series, Abramowitz and Stegun 26.2.12)
    // mean v·(1/a − 2/a³ + …) above 0 (the same series), a = |m|/v
    const t = truncatedNormal(-30, 1, 0, 10);
    expect(t.mean).toBeCloseTo(1 / 30 - 2 / 27000, 6);
    expect(t.logMass).toBeCloseTo(-450 - 0.5 * Math.log(2 * Math.PI) - Math.log(30) + Math.log(1 - 1 / 900), 4);
    const deep = truncatedNormal(-1000, 1, 0, 10);
    expect(deep.mean).toBeCloseTo(1e-3, 6);
  });
});

describe('the growth under a population of normals each cut at 0', () => {
  const population = [{ meanNm: -0.5, sigmaNm: 0.2, weight: 0.3 }, { meanNm: 0.1, sigmaNm: 0.05, weight: 0.5 }, { meanNm: 0.6, sigmaNm: 0.4, weight: 0.2 }];

  it('closed form agrees with the posterior on a grid (the level path, a flat level)', () => {
    for (const smoothNm of [0, 0.15]) {
      for (const g of [null, { meanNm: 0.2, sigmaNm: 0.3 }, { meanNm: -0.4, sigmaNm: 0.1 }]) {
        const closed = populationPosterior(population, 2, g, smoothNm);
        // A level whose reading does not depend on the growth adds nothing: growthPosterior takes the grid.
        const grid = growthPosterior({ maxNm: 2, population, gaussians: g ? [g] : [], smoothNm, level: { predict: (d) => new Float64Array(d.length), observed: 0, sigma: 1 } });
        expect(closed.deltaNm).toBeCloseTo(grid.deltaNm, 3);
        expect(closed.sigmaNm).toBeCloseTo(grid.sigmaNm, 3);
      }
    }
  });
});
