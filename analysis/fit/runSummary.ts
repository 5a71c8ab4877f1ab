import { type Design, designSpectrum, spectrumOfStack, spectrumRange } from '../design';
import { indexDrift } from '../stats';
import { type ChipCalibration } from './calibrateChip';
import { type AnalysisMode, type AnalysisResult, type LayerResult, type ToolingCheck } from './types';

/**
 * Run-level figures: index drift per material, tooling check, as-built against design spectrum.
 * The drift is read from `ownIndex` (each layer's own reading and its σ as reported) where given,
 * not from indices read together with their material's (fit/pooledIndex.ts), which lie on a trend
 * by construction; its line is weighted as the pool's (stats/indexDrift.ts), so where the pool
 * took the same layers, the pooled-index note's trend is the drift's.
 */
export function runSummary(
  design: Design, mode: AnalysisMode, segmentsInferred: boolean, layers: LayerResult[], chips: ChipCalibration[],
  warnings: string[], range: { fromNm: number; toNm: number; stepNm: number },
  ownIndex?: ReadonlyMap<number, { index: number; indexSigma: number }>,
): AnalysisResult {
  const drift = indexDrift(layers.map((l) => {
    const own = ownIndex?.get(l.layer);
    return {
      layer: l.layer, material: l.material, timeS: l.startTimeS, indexHeld: l.indexHeld,
      indexDeviation: own ? own.index - l.nominalIndex : l.indexDeviation, indexSigma: own ? own.indexSigma : l.indexSigma,
    };
  }));
  const tooling: ToolingCheck[] = [];
  const byMaterial = new Map<string, LayerResult[]>();
  for (const l of layers) {
    if (l.opticalToCrystalRatio === null) continue;
    byMaterial.set(l.material, [...(byMaterial.get(l.material) ?? []), l]);
  }
  for (const [material, list] of byMaterial) {
    const r = list.map((l) => l.opticalToCrystalRatio!);
    const mean = r.reduce((a, b) => a + b, 0) / r.length;
    const sd = r.length > 1 ? Math.sqrt(r.reduce((a, b) => a + (b - mean) ** 2, 0) / (r.length - 1)) : NaN;
    tooling.push({ material, layers: list.map((l) => l.layer), meanRatio: mean, ratioSigma: sd });
  }
  const byLayer = new Map(layers.map((l) => [l.layer, l]));
  let built = 0;
  for (const l of layers) built = Math.max(built, l.layer);
  const asBuilt = design.layers.slice(0, built).map((dl) => {
    const l = byLayer.get(dl.layer);
    return l ? { thicknessNm: l.thicknessNm, indexScale: l.index / l.nominalIndex } : { thicknessNm: dl.thicknessNm };
  });
  // Over the wavelengths where every material has an index (a measured table may cover the
  // monitor's wavelengths only): the spectrum is a by-product, never a reason to fail the run.
  const shown = spectrumRange(design, range);
  const empty = new Float64Array(0);
  const designSpec = shown ? designSpectrum(design, shown) : { wavelengthNm: empty, R: empty, T: empty };
  const builtSpec = shown ? spectrumOfStack(design, asBuilt, shown) : { wavelengthNm: empty, R: empty, T: empty };
  const runWarnings = [...warnings];
  if (!shown) runWarnings.push(`no spectrum: no wavelength of ${range.fromNm}–${range.toNm} nm has an index for every material of the design`);
  else if (shown.limitedBy) runWarnings.push(`spectrum shown over ${shown.fromNm}–${shown.toNm} nm only (${shown.limitedBy})`);
  for (const l of layers) for (const w of l.warnings) if (!w.startsWith('index held')) runWarnings.push(`layer ${l.layer}: ${w}`);
  return {
    format: 'fringelog.analysis/1', mode, design: design.name, segmentsInferred, layers, chips, indexDrift: drift, tooling,
    spectrum: { wavelengthNm: designSpec.wavelengthNm, designR: designSpec.R, designT: designSpec.T, asBuiltR: builtSpec.R, asBuiltT: builtSpec.T },
    warnings: runWarnings,
  };
}
