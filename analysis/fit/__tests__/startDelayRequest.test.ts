import { createReadStream, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../../design';
import { readTrace } from '../../trace';
import { findStartDelay } from '../analyzeRun';
import { layerSampleWork, type SampleWork } from '../layerSampleWork';
import { layerSpectrum, NO_SPECTRUM } from '../layerSpectrum';
import { profileFromRequest, type StartDelayProfileRequest } from '../startDelayRequest';

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');

async function mirror() {
  const designFile = path.join(samples, 'hr17-mirror-600.json'), traceFile = path.join(samples, 'bay3-hr17-run1120.csv');
  const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);
  const trace = await readTrace(createReadStream(traceFile), { fileName: traceFile, layerCount: design.layers.length });
  return { design, trace };
}

describe('the start delay\'s profiling pass asks another thread only for what it reads', () => {
  // The mirror's layers are 1 QWOT: their spectra are not read in the pass, nor any turning points the samples show.
  it('no spectrum under 3 QWOT and no turning points: the same pooled delay', async () => {
    const { design, trace } = await mirror();
    const works: SampleWork[] = [];
    const spectrumOf = async (tauS: Float64Array, y: Float64Array, wl: number, index: number, work?: SampleWork) => {
      works.push(work!);
      const spectrum = work?.spectrum === false ? NO_SPECTRUM : layerSpectrum(tauS, y, wl, index);
      return { ...spectrum, ...layerSampleWork(tauS, y, work!) };
    };
    const there = await findStartDelay(design, trace, { mode: 'refit', spectrumOf });
    expect(works.length).toBe(design.layers.length);
    expect(works.every((w) => w.spectrum === false && w.timeS === undefined)).toBe(true);
    expect(there).toEqual(await findStartDelay(design, trace, { mode: 'refit' }));
  });
});

describe('the start delay\'s profiles computed elsewhere (AnalyzeOptions.startDelayProfileOf)', () => {
  // The demo mirror: 17 layers cut at turning points, a shutter that opens late (the run's own note).
  it('gives the pooled delay computed on this thread, each chip\'s profiles from a copy of its request as another thread gets it', async () => {
    const { design, trace } = await mirror();
    const requests: StartDelayProfileRequest[] = [];
    const elsewhere = async (r: StartDelayProfileRequest) => {
      const copy = structuredClone(r);
      requests.push(copy);
      await new Promise((resolve) => setTimeout(resolve, 1));
      return profileFromRequest(copy);
    };
    const here = await findStartDelay(design, trace, { mode: 'refit' });
    const there = await findStartDelay(design, trace, { mode: 'refit', startDelayProfileOf: elsewhere });
    // one request per chip, its layers in order
    expect(requests.flatMap((r) => r.layers.filter((l) => l.profiled)).length).toBeGreaterThanOrEqual(10);
    expect(there).toEqual(here);
    expect(here!.kept).toBe(true);
  });
});
