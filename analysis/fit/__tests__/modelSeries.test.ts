import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { bbar4, synthTrace } from './scenarios';

describe('analyzeRun modelSeries', () => {
  it('gives the fitted reading at every layer sample, within the synthetic noise of the data, and NaN while idle', async () => {
    const design = bbar4();
    const noiseFraction = 0.002;
    const gain = 1.5;
    const { run, trace } = await synthTrace(design, { seed: 41, noiseFraction, gain, offset: 0.02 });
    const result = await analyzeRun(design, trace, { mode: 'refit', modelSeries: true });
    const model = result.model!;
    expect(model.length).toBe(trace.rowCount);
    let ss = 0, n = 0;
    for (let i = 0; i < model.length; i++) {
      if (run.layer[i] === 0) {
        expect(Number.isNaN(model[i])).toBe(true);
        continue;
      }
      const r = trace.signal[i] - model[i];
      ss += r * r;
      n++;
    }
    // The synthesiser adds Gaussian noise of σ = noiseFraction × gain; a good fit leaves about that.
    const rms = Math.sqrt(ss / n);
    expect(rms / (noiseFraction * gain)).toBeGreaterThan(0.9);
    expect(rms / (noiseFraction * gain)).toBeLessThan(1.2);
  });

  it('is absent unless asked for', async () => {
    const { trace } = await synthTrace(bbar4(), { seed: 42 });
    expect((await analyzeRun(bbar4(), trace)).model).toBeUndefined();
  });
});
