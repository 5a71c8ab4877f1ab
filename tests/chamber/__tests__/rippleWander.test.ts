import { describe, expect, it } from 'vitest';
import { chamberRng } from '..';
import { Detector } from '../detector';

// The lamp ripple's frequency wandering as the mains does (option lampRipple.frequencyWander): an
// Ornstein–Uhlenbeck excursion about the nominal frequency, its phase the integral. Read back here
// from the beat alone: 100.5 Hz read every 0.1 s beats at 0.5 Hz, and with an excursion of σ the
// beat's frequency, counted in zero crossings over 100 s windows, spreads by about σ.
const DT = 0.1;

function detector(frequencyWander?: { sigmaHz: number; correlationS: number }, seed = 5) {
  const root = chamberRng(seed);
  const o = { gain: 1, lampDriftPerHour: 0, darkOffset: 0, strayFraction: 0, whiteNoise: 0, lampRipple: { fraction: 0.002, frequencyHz: 100.5, frequencyWander } };
  return new Detector(o, DT, root.fork('white'), root.fork('correlated'), root.fork('spikes'), root.fork('ripple-wander'));
}

/** The beat's frequency in each window of w seconds, from its zero crossings. */
function beatFrequencies(d: Detector, hours: number, w: number): number[] {
  const out: number[] = [];
  let crossings = 0, last = 0, windowEnd = w;
  for (let k = 1; k * DT <= hours * 3600; k++) {
    const t = k * DT, r = d.lampAt(t) - 1;
    if (last !== 0 && Math.sign(r) !== Math.sign(last)) crossings++;
    last = r;
    if (t >= windowEnd - 1e-9) {
      out.push(crossings / (2 * w));
      crossings = 0;
      windowEnd += w;
    }
  }
  return out;
}

describe('a lamp ripple whose frequency wanders with the mains', () => {
  it('with no wander, the ripple of a fixed frequency, sample for sample', () => {
    const fixed = detector(), still = detector({ sigmaHz: 0, correlationS: 60 });
    for (let k = 0; k < 20000; k += 13) expect(still.lampAt(k * DT)).toBe(fixed.lampAt(k * DT));
  });

  it('spreads the beat\'s frequency by the wander\'s σ about its nominal, and keeps the ripple\'s amplitude', () => {
    const sigma = 0.05;
    const f = beatFrequencies(detector({ sigmaHz: sigma, correlationS: 3600 }), 80, 100);
    const mean = f.reduce((a, b) => a + b, 0) / f.length;
    const sd = Math.sqrt(f.reduce((a, b) => a + (b - mean) ** 2, 0) / (f.length - 1));
    // 80 h over a correlation time of 1 h: about 40 independent excursions, so the spread is read to about ±15 %
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.03);
    expect(sd).toBeGreaterThan(0.7 * sigma);
    expect(sd).toBeLessThan(1.3 * sigma);
    const fixed = beatFrequencies(detector(), 2, 100);
    for (const x of fixed) expect(Math.abs(x - 0.5)).toBeLessThan(0.011);
    const d = detector({ sigmaHz: sigma, correlationS: 3600 });
    for (let k = 0; k < 36000; k++) expect(Math.abs(d.lampAt(k * DT) - 1)).toBeLessThanOrEqual(0.002 + 1e-12);
  });
});
