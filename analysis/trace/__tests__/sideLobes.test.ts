import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth/prng';
import { hannLeakage, peaksClearOfSideLobes } from '../sideLobes';

/** The test over every larger peak, written out here (the rule as fringeSpectrum first applied it). */
function everyLarger<P extends { frequencyHz: number; amplitude: number }>(byAmplitude: P[], lobeHz: number): P[] {
  return byAmplitude.filter((p) => {
    for (let j = 0; j < byAmplitude.length && byAmplitude[j].amplitude * 3 * 0.0266 > p.amplitude; j++) {
      const q = byAmplitude[j];
      if (p.amplitude < 3 * q.amplitude * 0.0266 * Math.min(1, (2.5 / (Math.abs(p.frequencyHz - q.frequencyHz) / lobeHz)) ** 3)) return false;
    }
    return true;
  });
}


describe('peaksClearOfSideLobes', () => {
  it('keeps exactly the peaks the test over every larger peak keeps: noise-like spectra with strong lines, amplitudes over 8 decades', () => {
    for (let seed = 1; seed <= 60; seed++) {
      const rnd = createRng(seed).uniform;
      const binHz = 0.01 * (1 + rnd());
      const lobeHz = 2 * binHz;
      const byFrequency: { frequencyHz: number; amplitude: number; id: number }[] = [];
      let k = 1;
      for (let id = 0; k < 8000; id++) {
        // a few strong lines among many weak noise peaks, some exactly at the bound's edge
        const strong = rnd() < 0.01;
        const amplitude = strong ? 1 + 10 * rnd() : 10 ** (-8 * rnd()) * (rnd() < 0.5 ? 1 : 0.08);
        byFrequency.push({ frequencyHz: (k + rnd() - 0.5) * binHz, amplitude, id });
        k += 2 + Math.floor(rnd() * (seed % 3 === 0 ? 2 : 40));
      }
      const byAmplitude = byFrequency.slice().sort((p, q) => q.amplitude - p.amplitude);
      const got = peaksClearOfSideLobes(byAmplitude, byFrequency, lobeHz).map((p) => p.id);
      expect(got).toEqual(everyLarger(byAmplitude, lobeHz).map((p) => p.id));
      // and it is a test that removes something
      if (seed === 1) expect(got.length).toBeLessThan(byAmplitude.length);
    }
  });

  it('a peak just inside and just outside a larger one\'s side-lobe bound', () => {
    const lobeHz = 1;
    // a 1.0 line hides p at 10 bins when A_p < 3·0.0266·(2.5/10)³ = 1.246875e-3
    expect(3 * hannLeakage(1, 10)).toBeCloseTo(1.246875e-3, 15);
    const line = { frequencyHz: 100, amplitude: 1 };
    const inside = { frequencyHz: 110, amplitude: 1.24e-3 };
    const outside = { frequencyHz: 90, amplitude: 1.25e-3 };
    expect(peaksClearOfSideLobes([line, outside, inside], [outside, line, inside], lobeHz)).toEqual([line, outside]);
  });
});
