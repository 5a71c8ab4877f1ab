import { describe, expect, it } from 'vitest';
import { AnalysisInputError, analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';
import { chamberCsv, simulateChamberRun } from '@/tests/chamber';
import { mirrorDesign } from '@/tests/chamber/scenarios';

// Faults of issue 7 item 8, on traces from the independent chamber simulator (tests/chamber).
const json = mirrorDesign(6, 6);
const design = parseDesign(json);

async function traceWith(edit: (layer: Int32Array) => void) {
  const run = simulateChamberRun(json, { seed: 81, rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.0005 });
  edit(run.layer);
  return { run, trace: await readTraceText(chamberCsv(run), { fileName: 'faulty.csv', layerCount: design.layers.length }) };
}

describe('analyzeRun on faulty layer columns', () => {
  it('two single rows marked paused inside a layer: no crash, the layer joined from its three runs and still right', async () => {
    const { run, trace } = await traceWith((layer) => {
      const first = layer.indexOf(3), last = layer.lastIndexOf(3);
      const mid = (first + last) >> 1;
      layer[mid] = 0;
      layer[mid + 2] = 0;
    });
    const result = await analyzeRun(design, trace, { mode: 'sequential' });
    const l3 = result.layers[2];
    expect(l3.warnings).toContain('the layer was deposited in 3 runs; the pauses are left out of its time base');
    expect(Math.abs(l3.thicknessNm / run.truth.layers[2].thicknessNm - 1)).toBeLessThan(0.01);
  });

  it('a layer column of zeros fails the analysis, naming every layer', async () => {
    const { trace } = await traceWith((layer) => layer.fill(0));
    const error = await analyzeRun(design, trace).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AnalysisInputError);
    expect((error as AnalysisInputError).layers).toEqual([1, 2, 3, 4, 5, 6]);
    expect((error as AnalysisInputError).message).toMatch(/^6 of the design's 6 layers would get no result: layer 1 \(H\): the trace's layer column never says 1; /);
  });

  it('one design layer without samples, or with too few, fails the analysis naming that layer', async () => {
    const { trace } = await traceWith((layer) => layer.forEach((v, i) => v === 4 && (layer[i] = 0)));
    await expect(analyzeRun(design, trace)).rejects.toThrow("1 of the design's 6 layers would get no result: layer 4 (L): the trace's layer column never says 4");
    const few = await traceWith((layer) => {
      const first = layer.indexOf(5);
      layer.forEach((v, i) => v === 5 && i >= first + 6 && (layer[i] = 0));
    });
    await expect(analyzeRun(design, few.trace)).rejects.toThrow("layer 5 (H): only 6 samples (at least 10 are needed)");
  });
});
