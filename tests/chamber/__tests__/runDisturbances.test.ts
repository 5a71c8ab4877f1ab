import { describe, expect, it } from 'vitest';
import { runScenario } from '../harness/runScenario';
import { scenarios } from '../scenarios';

// A lamp's ripple the lock-in leaves, 0.2 % at 100.05 Hz, logged every 0.1 s: a 20 s beat
// (the simulator's option lampRipple). It passes unseen in each layer's own spectrum; the run's
// residuals taken together show it (fit/runDisturbances.ts). A reference column divides it out.
const RIPPLE = { lampRipple: { fraction: 0.002, frequencyHz: 100.05 } };
const scenario = (name: string, more = {}) => {
  const s = scenarios().find((x) => x.name === name)!;
  return { ...s, options: { ...s.options, ...more } };
};
const runWide = (warnings: string[]) => warnings.filter((w) => w.startsWith('periodic disturbance through the run'));

describe('periodic disturbances through the run', () => {
  it('the BBAR on level cuts: the beat found at 0.05 Hz, about the ripple\'s size, with the mains harmonics that fall there; none without it', { timeout: 300_000 }, async () => {
    for (const seed of [21, 22]) {
      const withIt = await runScenario(scenario('real chamber, BBAR', RIPPLE), seed, ['refit', 'sequential']);
      for (const r of Object.values(withIt.results)) {
        const w = runWide(r!.warnings);
        expect(w.length).toBe(1);
        const [, f, pct] = /at ([\d.]+) Hz .*?, ([\d.]+) % of full scale/.exec(w[0])!;
        expect(Math.abs(Number(f) - 0.05)).toBeLessThan(0.001);
        // 0.2 % of the lamp on readings of 0.85–0.95 of full scale, less what the fits take up
        expect(Number(pct)).toBeGreaterThan(0.1);
        expect(Number(pct)).toBeLessThan(0.22);
        expect(w[0]).toMatch(/100 .*Hz \(the 50 Hz mains and its harmonics/);
      }
      const without = await runScenario(scenario('real chamber, BBAR'), seed, ['refit', 'sequential']);
      for (const r of Object.values(without.results)) expect(runWide(r!.warnings)).toEqual([]);
    }
  });

  it('with a lamp reference the ripple divides out and nothing is said', { timeout: 300_000 }, async () => {
    const { results } = await runScenario(scenario('real chamber, BBAR, lamp reference', RIPPLE), 21, ['refit']);
    expect(runWide(results.refit!.warnings)).toEqual([]);
  });

  it('the 18-layer mirror over three chips: found in both modes at half the ripple (transmittance about 0.5)', { timeout: 300_000 }, async () => {
    const { results } = await runScenario(scenario('real chamber, mirror', RIPPLE), 21, ['refit', 'sequential']);
    for (const r of Object.values(results)) {
      const w = runWide(r!.warnings);
      expect(w.length).toBe(1);
      expect(w[0]).toMatch(/at 0\.0500 Hz \(period 20\.0 s\), 0\.(09|10|11) % of full scale/);
    }
  });
});
