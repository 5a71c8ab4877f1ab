import { describe, expect, it } from 'vitest';
import { individualsChart, newestPointRules, runRules } from '..';

describe('individualsChart', () => {
  it('gives the limits of the published flow-rate example', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2.2, "Individuals control charts":
    // flow rate of the first 10 batches; the handbook prints X̄ = 50.81, MR̄ = 1.8778,
    // UCL = 55.8041, LCL = 45.8159 and the moving-range UCL 6.1347.
    const flow = [49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
    const c = individualsChart(flow);
    expect(c.center).toBeCloseTo(50.81, 10);
    expect(c.meanMovingRange).toBeCloseTo(1.8778, 4);
    expect(c.upper).toBeCloseTo(55.8041, 3);
    expect(c.lower).toBeCloseTo(45.8159, 3);
    expect(c.movingRangeUpper).toBeCloseTo(6.1347, 3);
    // "On both charts the process is in control": no rule 1 signal.
    expect(runRules(flow, c.center, c.sigma).filter((s) => s.rule === 1)).toEqual([]);
  });

  it('refuses a baseline of fewer than two points or with a non-number', () => {
    expect(() => individualsChart([1])).toThrow('individualsChart: the baseline needs at least two points (got 1)');
    expect(() => individualsChart([1, NaN])).toThrow('individualsChart: baseline point 1 is NaN, not a finite number');
  });
});

describe('runRules (Western Electric)', () => {
  const rulesAt = (values: number[]) => runRules(values, 0, 1).map((s) => `${s.rule}@${s.index}${s.side === 'above' ? '+' : '-'}`);

  it('rule 1: a point beyond 3σ, either side', () => {
    expect(rulesAt([0.2, -0.4, 3.2, 0.1, -3.1])).toEqual(['1@2+', '1@4-']);
    expect(rulesAt([0.2, -0.4, 3.0, 0.1])).toEqual([]); // on the limit is not beyond it
  });

  it('rule 2: two of three beyond 2σ on one side, not on opposite sides', () => {
    expect(rulesAt([0, 2.5, 0.3, 2.2])).toEqual(['2@3+']);
    expect(rulesAt([0, 2.5, 0.3, -2.2])).toEqual([]);
    expect(rulesAt([0, 2.5, 0.3, 0.1, 2.2])).toEqual([]);
  });

  it('rule 3: four of five beyond 1σ on one side', () => {
    expect(rulesAt([0, -1.5, -1.2, 0.4, -1.1, -1.8])).toEqual(['3@5-']);
    expect(rulesAt([0, -1.5, -1.2, 0.4, -1.1, 1.8])).toEqual([]);
  });

  it('rule 4: eight in a row on one side, signalled from the eighth point on', () => {
    const run = [-0.2, 0.3, 0.5, 0.1, 0.7, 0.2, 0.4, 0.6, 0.3, 0.2, -0.1];
    expect(rulesAt(run)).toEqual(['4@8+', '4@9+']);
    const signals = runRules(run, 0, 1);
    expect(signals[0].points).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });

  it('a shift of 1.5σ from the 20th point on is caught, the in-control stretch is not', () => {
    const base = [0.3, -0.8, 0.5, -0.2, 0.9, -1.1, 0.4, -0.3, 0.6, -0.5, 0.2, -0.7, 0.8, -0.4, 0.1, -0.6, 0.7, -0.1, 0.4, -0.9];
    const shifted = base.concat([1.2, 1.9, 1.4, 2.1, 1.6, 1.3, 1.8, 1.1]);
    const signals = runRules(shifted, 0, 1);
    expect(signals.filter((s) => s.index < 20)).toEqual([]);
    expect(signals.some((s) => s.rule === 3 || s.rule === 2)).toBe(true);
  });

  it('refuses a zero sigma', () => {
    expect(() => runRules([1, 2], 0, 0)).toThrow('runRules: sigma must be > 0 (got 0)');
  });
});

describe('newestPointRules', () => {
  // Baseline alternating ±0.5 around 10: MR̄ = 1, σ̂ = 1/1.128 = 0.8865, limits 10 ± 2.66.
  const base = Array.from({ length: 20 }, (_, i) => (i % 2 ? 10.5 : 9.5));

  it('flags a newest value beyond 3σ of the runs before it, and not one inside', () => {
    expect(newestPointRules(base, 12.7)).toEqual([1]);
    expect(newestPointRules(base, 12.6)).toEqual([]);
  });

  it('finds rule 2 only when the newest value completes it', () => {
    // One earlier value 12.0 enters the baseline (the last 20): X̄ = 202.5/20 = 10.125,
    // MR̄ = (18·1 + 1.5)/19 = 1.02632, σ̂ = 0.90986; 2σ line 11.945, 3σ line 12.855.
    expect(newestPointRules(base, 12.0)).toEqual([]);
    expect(newestPointRules([...base, 12.0], 12.3)).toEqual([2]);
    expect(newestPointRules([...base, 12.0], 8.0)).toEqual([]);
  });

  it('says nothing on too short or flat a history', () => {
    expect(newestPointRules([1, 2, 3], 50)).toEqual([]);
    expect(newestPointRules(Array(10).fill(4), 50)).toEqual([]);
  });
});
