import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fromNK, stackResponse, type LayerAt, type StackAt } from '..';

const layerArb = fc.record({
  n: fc.double({ min: 1.2, max: 3.5, noNaN: true }),
  k: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.5, noNaN: true })),
  thicknessNm: fc.double({ min: 0, max: 400, noNaN: true }),
});
const stackArb = fc.record({
  ns: fc.double({ min: 1.3, max: 2.0, noNaN: true }),
  layers: fc.array(layerArb, { minLength: 0, maxLength: 12 }),
  wl: fc.double({ min: 300, max: 1200, noNaN: true }),
  angleDeg: fc.double({ min: 0, max: 80, noNaN: true }),
  pol: fc.constantFrom('s' as const, 'p' as const),
});
const toStack = (s: { ns: number; layers: { n: number; k: number; thicknessNm: number }[] }): StackAt => ({
  ambient: fromNK(1),
  substrate: fromNK(s.ns),
  layers: s.layers.map((l): LayerAt => ({ n: fromNK(l.n, l.k), thicknessNm: l.thicknessNm })),
});

describe('energy and reciprocity (Macleod, Thin-Film Optical Filters, ch. 2; property tests)', () => {
  it('R + T + A = 1, 0 ≤ R, T and A ≥ 0, for random absorbing stacks, both sides, with or without backside', () => {
    fc.assert(
      fc.property(stackArb, fc.boolean(), fc.constantFrom('ambient' as const, 'substrate' as const), (s, backside, incidence) => {
        const stack = toStack(s);
        const angleDeg = incidence === 'substrate' && !backside ? Math.min(s.angleDeg, (Math.asin(1 / s.ns) * 180) / Math.PI - 1) : s.angleDeg;
        const r = stackResponse(stack, s.wl, { angleDeg, pol: s.pol, backside, incidence });
        expect(r.R + r.T + r.A).toBeCloseTo(1, 10);
        expect(r.R).toBeGreaterThanOrEqual(0);
        expect(r.T).toBeGreaterThanOrEqual(0);
        expect(r.A).toBeGreaterThanOrEqual(-1e-12);
        if (s.layers.every((l) => l.k === 0)) expect(Math.abs(r.A)).toBeLessThan(1e-10);
      }),
      { numRuns: 500 },
    );
  });

  it('T is the same from both sides (absorbing stacks, oblique incidence, Snell-matched angles)', () => {
    fc.assert(
      fc.property(stackArb, (s) => {
        const stack = toStack(s);
        const inside = (Math.asin(Math.sin((s.angleDeg * Math.PI) / 180) / s.ns) * 180) / Math.PI;
        const f = stackResponse(stack, s.wl, { angleDeg: s.angleDeg, pol: s.pol });
        const b = stackResponse(stack, s.wl, { angleDeg: inside, pol: s.pol, incidence: 'substrate' });
        expect(b.T).toBeCloseTo(f.T, 10);
      }),
      { numRuns: 300 },
    );
  });

  it('quarter-wave stacks of any indices: R from the admittance recurrence Y → n²/Y (Macleod ch. 2)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.3, max: 2.0, noNaN: true }), fc.array(fc.double({ min: 1.2, max: 3.5, noNaN: true }), { minLength: 1, maxLength: 15 }), (ns, ns_) => {
        let y = ns;
        for (const n of ns_) y = (n * n) / y;
        const stack: StackAt = { ambient: fromNK(1), substrate: fromNK(ns), layers: ns_.map((n) => ({ n: fromNK(n), thicknessNm: 500 / (4 * n) })) };
        expect(stackResponse(stack, 500).R).toBeCloseTo(((1 - y) / (1 + y)) ** 2, 10);
      }),
      { numRuns: 300 },
    );
  });
});
