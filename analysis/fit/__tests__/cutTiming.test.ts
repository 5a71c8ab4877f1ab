import { describe, expect, it } from 'vitest';
import { modelTurningPoints, subsampleUniform, timeToThickness } from '..';
import { fromNK } from '../../optics';

describe('modelTurningPoints', () => {
  it('puts the extrema of a single layer on glass at quarter-wave multiples, with the quarter-wave transmittance', () => {
    // A quarter-wave layer turns the substrate admittance ηs into n²/ηs (H. A. Macleod,
    // Thin-Film Optical Filters, 4th ed., ch. 2, quarter-wave layers): T = 4η0Y/(η0 + Y)², Y = n²/ηs,
    // and a half-wave layer is absent (T of the bare face, 4η0ηs/(η0 + ηs)²).
    const n = 2.1, ns = 1.52, wl = 550;
    const optics = { ambient: fromNK(1), substrate: fromNK(ns), backside: false, wavelengthNm: wl, mode: 'T' as const };
    const tps = modelTurningPoints(optics, [], n, 0, 2.2 * (wl / (2 * n)));
    const q = wl / (4 * n);
    expect(tps.map((t) => t.kind)).toEqual(['min', 'max', 'min', 'max']);
    tps.forEach((tp, i) => expect(tp.thicknessNm).toBeCloseTo((i + 1) * q, 2));
    const Y = (n * n) / ns;
    expect(tps[0].signal).toBeCloseTo((4 * Y) / (1 + Y) ** 2, 10);
    expect(tps[1].signal).toBeCloseTo((4 * ns) / (1 + ns) ** 2, 10);
  });
});

describe('timeToThickness', () => {
  it('inverts d = r·τ + a·τ²/2, with and without drift', () => {
    expect(timeToThickness(30, 0.3, 0)).toBeCloseTo(100, 12);
    const tau = timeToThickness(100, 0.3, 1e-4);
    expect(0.3 * tau + 0.5 * 1e-4 * tau * tau).toBeCloseTo(100, 10);
    expect(timeToThickness(100, 0.3, -1e-3)).toBeNaN(); // the rate falls to zero first
    expect(timeToThickness(10, -0.3, 0)).toBeNaN();
  });
});

describe('subsampleUniform', () => {
  it('keeps every sample when there are few, and spreads maxPoints over time otherwise', () => {
    const t = Float64Array.from({ length: 101 }, (_, i) => i * 0.1);
    expect(Array.from(subsampleUniform(t, 10, 15, 100))).toEqual([10, 11, 12, 13, 14]);
    expect(Array.from(subsampleUniform(t, 0, 101, 11))).toEqual([0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100]);
    expect(subsampleUniform(t, 5, 5, 10)).toHaveLength(0);
  });
});
