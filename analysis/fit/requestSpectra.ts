import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { type TraceData } from '../trace';
import { type LayerSamples } from './layerSamples';
import { type LayerSpectrum } from './layerSpectrum';
import { type SampleWorkResult } from './layerSampleWork';
import { type AnalyzeOptions } from './types';

/**
 * Asks spectrumOf for every layer's spectrum at once, with the arguments analyzeRun's loop would
 * give layerSpectrum (the layer's τ and readings, its monitor wavelength, the material's nominal
 * index there) and the work on the samples that needs no fit (layerSampleWork: the readings'
 * times, the bin counts the fits will use), so a caller computing them elsewhere works ahead of
 * the fits.
 */
export function requestSpectra(
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>,
  design: Design,
  trace: TraceData,
  order: readonly DesignLayer[],
  samplesByLayer: ReadonlyMap<number, LayerSamples>,
  binPoints: (layer: number) => number[],
): Map<number, Promise<LayerSpectrum & Partial<SampleWorkResult>>> {
  const out = new Map<number, Promise<LayerSpectrum & Partial<SampleWorkResult>>>();
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    const wl = dl.monitor.wavelengthNm;
    const y = gather(trace.signal, samples.indices), timeS = gather(trace.timeS, samples.indices);
    out.set(dl.layer, spectrumOf(samples.tauS, y, wl, indexAt(design.materials[dl.material], wl).re, { timeS, binPoints: binPoints(dl.layer) }));
  }
  return out;
}

function gather(values: Float64Array, indices: Int32Array): Float64Array {
  const out = new Float64Array(indices.length);
  for (let i = 0; i < out.length; i++) out[i] = values[indices[i]];
  return out;
}
