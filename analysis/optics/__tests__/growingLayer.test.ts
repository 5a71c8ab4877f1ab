import { describe, expect, it } from 'vitest';
import { fromNK, growingLayerSignal, stackResponse, type LayerAt } from '..';
import { stackRT } from '@/tests/chamber/thinFilm';

const air = fromNK(1);
const glass = fromNK(1.52);
const below: LayerAt[] = [
  { n: fromNK(2.35, 0.002), thicknessNm: 58.5 },
  { n: fromNK(1.46), thicknessNm: 94.2 },
];
const lossless: LayerAt[] = [
  { n: fromNK(2.35), thicknessNm: 58.5 },
  { n: fromNK(1.46), thicknessNm: 94.2 },
];

describe('growingLayerSignal', () => {
  it('matches the full stack evaluation at every thickness (T, R, backside, oblique)', () => {
    const thickness = Float64Array.from({ length: 41 }, (_, i) => i * 5);
    for (const mode of ['T', 'R'] as const) {
      for (const backside of [false, true]) {
        // absorbing, and lossless (below and growing: the kernel's shortcuts for real admittances)
        for (const [angleDeg, stack, growing] of [[0, below, fromNK(2.1, 0.001)], [20, below, fromNK(2.1, 0.001)], [0, lossless, fromNK(2.1)], [20, lossless, fromNK(2.1)]] as const) {
          const spec = { ambient: air, substrate: glass, below: stack, growing, wavelengthNm: 550, mode, backside, angleDeg };
          const curve = growingLayerSignal(spec, thickness);
          thickness.forEach((d, i) => {
            const full = stackResponse(
              { ambient: air, substrate: glass, layers: [...stack, { n: spec.growing, thicknessNm: d }] },
              550,
              { backside, angleDeg },
            );
            expect(curve[i]).toBeCloseTo(mode === 'T' ? full.T : full.R, 12);
            if (angleDeg === 0) {
              // and against optics that share no code with analysis/ (the chamber simulator's, tests/chamber)
              const layers = [...stack, { n: spec.growing, thicknessNm: d }].map((l) => ({ n: l.n.re, k: -l.n.im, thicknessNm: l.thicknessNm }));
              const own = stackRT(layers, 550, { ambient: 1, substrate: 1.52, backside });
              expect(curve[i]).toBeCloseTo(mode === 'T' ? own.T : own.R, 12);
            }
          });
        }
      }
    }
  });

  it('a quarter-wave of n = 1.38 on 1.52 turns at R = 1.2601 % (Macleod, Thin-Film Optical Filters, ch. 3)', () => {
    const qw = 550 / (4 * 1.38);
    const curve = growingLayerSignal({ ambient: air, substrate: glass, below: [], growing: fromNK(1.38), wavelengthNm: 550, mode: 'R' }, [qw - 1, qw, qw + 1]);
    expect(curve[1]).toBeCloseTo(0.012601, 6);
    expect(curve[0]).toBeGreaterThan(curve[1]);
    expect(curve[2]).toBeGreaterThan(curve[1]);
  });
});
