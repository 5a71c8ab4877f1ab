import { createReadStream, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../../design';
import { readTrace } from '../../trace';
import { analyzeRun } from '../analyzeRun';
import { modelSquaredResiduals, type ModelResidualsRequest } from '../layerResult';

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');

async function run(designName: string, traceName: string) {
  const designFile = path.join(samples, designName), traceFile = path.join(samples, traceName);
  const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);
  const trace = () => readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
  return { design, trace };
}

describe('the layers\' residual sums made elsewhere (AnalyzeOptions.modelResidualsOf)', () => {
  // the single-layer AR cut late past its turning point, and the 17-layer mirror with a rate spike
  it.each([['ar1-mgf2-crown.json', 'bay1-ar1-run0413-overshoot.csv'], ['hr17-mirror-600.json', 'bay3-hr17-run1121-spike.csv']])(
    'from a copy of each request, as another thread receives it, give the results made here: %s', async (designName, traceName) => {
      const { design, trace } = await run(designName, traceName);
      for (const mode of ['sequential', 'refit'] as const) {
        const here = await analyzeRun(design, await trace(), { mode });
        const awaited: number[] = [];
        let asked = 0;
        const elsewhere = await analyzeRun(design, await trace(), {
          mode,
          modelResidualsOf: (r: ModelResidualsRequest) => {
            const layer = asked++;
            const sum = modelSquaredResiduals(structuredClone(r));
            return { then: (ok: (v: number) => unknown) => (awaited.push(layer), Promise.resolve(ok(sum))) } as PromiseLike<number>;
          },
        });
        expect(elsewhere).toEqual(here);
        // every layer asked for at once, then awaited from the last down
        expect(asked).toBe(here.layers.length);
        expect(awaited).toEqual([...Array(asked).keys()].reverse());
      }
    }, 60_000);

  it("are the ones the results report: a sum four times as large reports residuals twice as large", async () => {
    const { design, trace } = await run('hr17-mirror-600.json', 'bay3-hr17-run1120.csv');
    const here = await analyzeRun(design, await trace(), { mode: 'refit' });
    const scaled = await analyzeRun(design, await trace(), { mode: 'refit', modelResidualsOf: async (r) => 4 * modelSquaredResiduals(r) });
    expect(scaled.layers.map((l) => l.residualRms / 2)).toEqual(here.layers.map((l) => expect.closeTo(l.residualRms, 12)));
    expect(scaled.layers.map((l) => l.thicknessNm)).toEqual(here.layers.map((l) => l.thicknessNm));
  }, 60_000);
});
