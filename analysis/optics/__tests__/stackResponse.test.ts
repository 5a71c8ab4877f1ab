import { describe, expect, it } from 'vitest';
import { fromNK, stackResponse, type StackAt } from '..';

const air = fromNK(1);
const glass = fromNK(1.52);

describe('stackResponse against published values', () => {
  it('bare glass n = 1.52, one face: R = ((1 − 1.52)/(1 + 1.52))² = 4.258 % (Fresnel; Born & Wolf, Principles of Optics §1.5)', () => {
    const r = stackResponse({ ambient: air, substrate: glass, layers: [] }, 550);
    expect(r.R).toBeCloseTo(0.0425799, 6);
    expect(r.R + r.T).toBeCloseTo(1, 12);
  });

  it('bare glass both faces incoherent: R = 2R₁/(1 + R₁) = 8.168 %, T = 91.832 % (Macleod, Thin-Film Optical Filters, ch. 2)', () => {
    const r = stackResponse({ ambient: air, substrate: glass, layers: [] }, 550, { backside: true });
    expect(r.R).toBeCloseTo(0.0816817, 6);
    expect(r.T).toBeCloseTo(0.9183183, 6);
  });

  it('quarter-wave MgF2 (1.38) on 1.52 at 550 nm: R = ((1.52 − 1.38²)/(1.52 + 1.38²))² = 1.2601 % (Macleod, ch. 3)', () => {
    const d = 550 / (4 * 1.38);
    expect(d).toBeCloseTo(99.6377, 4);
    const stack: StackAt = { ambient: air, substrate: glass, layers: [{ n: fromNK(1.38), thicknessNm: d }] };
    const r = stackResponse(stack, 550);
    expect(r.R).toBeCloseTo(((1.52 - 1.38 ** 2) / (1.52 + 1.38 ** 2)) ** 2, 10);
    expect(r.R).toBeCloseTo(0.012601, 6);
  });

  it('glass 1.52 at 45°: Rs = 9.673 %, Rp = 0.936 % (Fresnel equations; Hecht, Optics §4.6)', () => {
    const stack: StackAt = { ambient: air, substrate: glass, layers: [] };
    expect(stackResponse(stack, 550, { angleDeg: 45, pol: 's' }).R).toBeCloseTo(0.096735, 5);
    expect(stackResponse(stack, 550, { angleDeg: 45, pol: 'p' }).R).toBeCloseTo(0.0093575, 5);
  });

  it('Rp = 0 at Brewster angle arctan(1.52) (Hecht, Optics §8.6)', () => {
    const stack: StackAt = { ambient: air, substrate: glass, layers: [] };
    const brewster = (Math.atan(1.52) * 180) / Math.PI;
    expect(stackResponse(stack, 550, { angleDeg: brewster, pol: 'p' }).R).toBeLessThan(1e-15);
  });

  it('an absorbing stack conserves energy and T is the same from both sides (reciprocity; Macleod ch. 2)', () => {
    const stack: StackAt = {
      ambient: air,
      substrate: glass,
      layers: [
        { n: fromNK(2.3, 0.05), thicknessNm: 57 },
        { n: fromNK(1.46, 0.001), thicknessNm: 110 },
        { n: fromNK(3.2, 1.1), thicknessNm: 12 },
      ],
    };
    for (const pol of ['s', 'p'] as const) {
      const f = stackResponse(stack, 633, { angleDeg: 30, pol });
      const b = stackResponse(stack, 633, { angleDeg: (Math.asin(Math.sin(Math.PI / 6) / 1.52) * 180) / Math.PI, pol, incidence: 'substrate' });
      expect(f.R + f.T + f.A).toBeCloseTo(1, 12);
      expect(f.A).toBeGreaterThan(0);
      expect(b.T).toBeCloseTo(f.T, 12);
      expect(b.R).not.toBeCloseTo(f.R, 3);
    }
  });
});
