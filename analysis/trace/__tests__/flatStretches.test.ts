import { describe, expect, it } from 'vitest';
import { flatStretches } from '../flatStretches';
import { gaussian } from './rng';

/** 0.1 s samples: flat, a cosine fringe (flat at its turning points), a 3 s pause after a steep stretch, a level step. */
function trace(noise: number) {
  const timeS: number[] = [], signal: number[] = [];
  const rnd = gaussian(7);
  const at = (t: number) => {
    if (t < 20) return 0.9;
    if (t < 220) return 0.6 + 0.3 * Math.cos((Math.PI * (t - 20)) / 100); // two quarter-waves: a turning point at 120 s inside
    if (t < 240) return 0.9; // pause at the level it was cut at (a turning point)
    if (t < 300) return 0.9 - 0.005 * (t - 240); // steep, cut at 0.6
    if (t < 303) return 0.6; // a short pause after a level cut
    if (t < 360) return 0.6 + 0.004 * (t - 303);
    if (t < 380) return 0.828;
    return 0.5; // a level step (another chip), flat to the end
  };
  for (let i = 0; i < 4000; i++) {
    timeS.push(i * 0.1);
    signal.push(at(i * 0.1) + noise * rnd());
  }
  return { timeS, signal };
}

describe('flatStretches', () => {
  it('finds the pauses, the short one after a steep cut included, and splits at a level step', () => {
    const { timeS, signal } = trace(0.0005);
    const flats = flatStretches(timeS, signal).map((f) => [timeS[f.startIndex], timeS[f.endIndex - 1], f.startLevel, f.endLevel]);
    const covering = (t: number) => flats.find(([a, b]) => a <= t && t <= b);
    for (const t of [10, 230, 301.5, 370, 390]) expect(covering(t), `${t} s`).toBeDefined();
    // steep stretches are not flat
    for (const t of [270, 330]) expect(covering(t), `${t} s`).toBeUndefined();
    // the stretch before the step and the one after it are separate, each with its own level
    expect(covering(370)).not.toBe(covering(390));
    expect(covering(390)![2]).toBeCloseTo(0.5, 2);
    // the pause after the turning-point cut reaches into the turning point's own flat top (what the design must sort out)
    expect(covering(230)![0]).toBeLessThan(220);
  });

  it('returns nothing for a trace too short to judge', () => {
    expect(flatStretches([0, 0.1, 0.2], [1, 1, 1])).toEqual([]);
  });
});
