import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDesign } from '../../design';
import { type Segment, type TraceData } from '../../trace';
import { gatherLayerSamples, type LayerSamples } from '../layerSamples';
import { type SampleWork } from '../layerSampleWork';
import { NO_SPECTRUM } from '../layerSpectrum';
import { requestSpectra } from '../requestSpectra';

const designFile = path.resolve(import.meta.dirname, '../../../sample-traces/hr17-mirror-600.json');
const design = parseDesign(JSON.parse(readFileSync(designFile, 'utf8')), designFile);

/** A trace of 100 samples whose columns lie on shared memory (as readTraceRows keeps them for a second thread) or not. */
function trace(shared: boolean): TraceData {
  const column = (f: (i: number) => number) => {
    const a = new Float64Array(shared ? new SharedArrayBuffer(800) : new ArrayBuffer(800));
    for (let i = 0; i < 100; i++) a[i] = f(i);
    return a;
  };
  return { meta: {}, columns: ['time_s', 'signal'], timeS: column((i) => 0.1 * i), signal: column((i) => 0.4 + 0.001 * i * i), layer: null, chip: null, crystalNm: null, rowCount: 100, warnings: [], separator: ',', headerLine: 1 };
}

/** Layer 1 on samples 10–59 in one run; layer 2 paused: samples 60–69 and 80–99. */
const layers = new Map<number, LayerSamples>([
  [1, { layer: 1, chip: 1, indices: Int32Array.from({ length: 50 }, (_, k) => 10 + k), tauS: Float64Array.from({ length: 50 }, (_, k) => 0.1 * k), startTimeS: 1, endTimeS: 5.9, runs: 1 }],
  [2, { layer: 2, chip: 1, indices: Int32Array.from([...Array(10).keys()].map((k) => 60 + k).concat([...Array(20).keys()].map((k) => 80 + k))), tauS: Float64Array.from({ length: 30 }, (_, k) => 0.1 * k), startTimeS: 6, endTimeS: 9.9, runs: 2 }],
]);

async function asked(t: TraceData) {
  const got = new Map<number, { y: Float64Array; timeS: Float64Array }>();
  const spectra = requestSpectra(async (_tauS, y, _wl, _index, work?: SampleWork) => {
    got.set(got.size + 1, { y, timeS: work!.timeS! });
    return NO_SPECTRUM;
  }, design, t, design.layers.slice(0, 2), layers, () => [50]);
  await Promise.all(spectra.values());
  return got;
}

describe('requestSpectra hands each layer its readings and times', () => {
  it('as views of the shared columns for a layer in one run (nothing copied), as copies for a paused one; the same values either way', async () => {
    for (const shared of [true, false]) {
      const t = trace(shared);
      const got = await asked(t);
      for (const [layer, s] of layers) {
        const { y, timeS } = got.get(layer)!;
        expect(Array.from(y)).toEqual(Array.from(s.indices, (i) => t.signal[i]));
        expect(Array.from(timeS)).toEqual(Array.from(s.indices, (i) => t.timeS[i]));
        const view = shared && s.runs === 1;
        expect(y.buffer === t.signal.buffer).toBe(view);
        expect(timeS.buffer === t.timeS.buffer).toBe(view);
      }
    }
  });

  it("gatherLayerSamples puts a layer's τ on shared memory with shared columns (handed over uncopied), with the same values", () => {
    const segment = (layer: number, startIndex: number, endIndex: number, run: number): Segment => ({
      layer, chip: 1, startIndex, endIndex, startTimeS: 0.1 * startIndex, endTimeS: 0.1 * (endIndex - 1), sampleCount: endIndex - startIndex, run,
    });
    const segments = [segment(1, 10, 60, 1), segment(2, 60, 70, 1), segment(2, 80, 100, 2)];
    const [own, sharedOnes] = [gatherLayerSamples(trace(false), segments), gatherLayerSamples(trace(true), segments)];
    for (const layer of [1, 2]) {
      expect(sharedOnes.get(layer)!.tauS.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(own.get(layer)!.tauS.buffer).not.toBeInstanceOf(SharedArrayBuffer);
      expect(Array.from(sharedOnes.get(layer)!.tauS)).toEqual(Array.from(own.get(layer)!.tauS));
    }
    // paused layer 2: τ runs on one sample step after the pause (0.1 s), not across it
    expect(sharedOnes.get(2)!.tauS[10]).toBeCloseTo(sharedOnes.get(2)!.tauS[9] + 0.1, 12);
  });
});
