import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { type TraceData } from '../trace';
import { type LayerSamples } from './layerSamples';
import { type LayerSpectrum } from './layerSpectrum';
import { type AnalyzeOptions } from './types';

/**
 * Asks spectrumOf for every layer's spectrum at once, with the arguments analyzeRun's loop would
 * give layerSpectrum (the layer's τ and readings, its monitor wavelength, the material's nominal
 * index there), so a caller computing them elsewhere works ahead of the fits.
 */
export function requestSpectra(
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>,
  design: Design,
  trace: TraceData,
  order: readonly DesignLayer[],
  samplesByLayer: ReadonlyMap<number, LayerSamples>,
): Map<number, Promise<LayerSpectrum>> {
  const out = new Map<number, Promise<LayerSpectrum>>();
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    const wl = dl.monitor.wavelengthNm;
    const y = new Float64Array(samples.indices.length);
    for (let i = 0; i < y.length; i++) y[i] = trace.signal[samples.indices[i]];
    out.set(dl.layer, spectrumOf(samples.tauS, y, wl, indexAt(design.materials[dl.material], wl).re));
  }
  return out;
}
