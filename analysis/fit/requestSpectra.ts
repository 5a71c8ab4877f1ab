import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { type TraceData } from '../trace';
import { type LayerSamples } from './layerSamples';
import { type LayerSpectrum } from './layerSpectrum';
import { sampleReadings } from './sampleReadings';
import { type SampleWorkResult } from './layerSampleWork';
import { type AnalyzeOptions } from './types';

/**
 * Asks spectrumOf for every layer's spectrum at once, with the arguments analyzeRun's loop would
 * give layerSpectrum (the layer's τ and readings, its monitor wavelength, the material's nominal
 * index there) and the work on the samples that needs no fit (layerSampleWork: the readings'
 * times, the bin counts the fits will use), so a caller computing them elsewhere works ahead of
 * the fits. For the start delay's profiling pass (`profiling`), whose fits only build the stack
 * each profile stands on, only what it reads: the bin means, and the spectrum of a layer of
 * PROFILE_PASS_SPECTRUM_QWOT or more (as analyzeRun's loop computes it there).
 */
export function requestSpectra(
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>,
  design: Design,
  trace: TraceData,
  order: readonly DesignLayer[],
  samplesByLayer: ReadonlyMap<number, LayerSamples>,
  binPoints: (layer: number) => number[],
  profiling = false,
): Map<number, Promise<LayerSpectrum & Partial<SampleWorkResult>>> {
  const out = new Map<number, Promise<LayerSpectrum & Partial<SampleWorkResult>>>();
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    const wl = dl.monitor.wavelengthNm;
    const index = indexAt(design.materials[dl.material], wl).re;
    const y = sampleReadings(trace.signal, samples.indices);
    const work = profiling
      ? { binPoints: binPoints(dl.layer), spectrum: (4 * index * dl.thicknessNm) / wl >= PROFILE_PASS_SPECTRUM_QWOT }
      : { timeS: sampleReadings(trace.timeS, samples.indices), binPoints: binPoints(dl.layer) };
    out.set(dl.layer, spectrumOf(samples.tauS, y, wl, index, work));
  }
  return out;
}

/**
 * The profiling pass reads no spectrum of a layer under 3 QWOT (1.5 fringes), whose fringe rate
 * comes in steps of one fringe per layer; its fits only build the stack each profile stands on
 * (measured: δ̂ and σ the same on the bench's 40-layer run and 8 chamber runs).
 */
export const PROFILE_PASS_SPECTRUM_QWOT = 3;
