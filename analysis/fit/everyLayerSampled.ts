import { type Design } from '../design';
import { AnalysisInputError } from './AnalysisInputError';
import { type LayerSamples } from './layerSamples';

/** Fewest samples a layer is fitted from. */
export const MIN_LAYER_SAMPLES = 10;

/**
 * Every design layer must get a result: a layer with no samples (or too few to fit) fails the
 * analysis, naming it, rather than leaving a run that looks complete.
 */
export function assertEveryLayerSampled(design: Design, samplesByLayer: ReadonlyMap<number, LayerSamples>, inferred: boolean): void {
  const faults: { layer: number; why: string }[] = [];
  for (const l of design.layers) {
    const n = samplesByLayer.get(l.layer)?.tauS.length ?? 0;
    if (n >= MIN_LAYER_SAMPLES) continue;
    const why = n === 0
      ? inferred ? 'no segment of the trace was found for it' : `the trace's layer column never says ${l.layer}`
      : `only ${n} sample${n > 1 ? 's' : ''} (at least ${MIN_LAYER_SAMPLES} are needed)`;
    faults.push({ layer: l.layer, why });
  }
  if (faults.length === 0) return;
  const shown = faults.slice(0, 10).map((f) => `layer ${f.layer} (${design.layers[f.layer - 1].material}): ${f.why}`);
  const more = faults.length > 10 ? `; and ${faults.length - 10} more` : '';
  throw new AnalysisInputError(
    'layer_without_result', faults.map((f) => f.layer),
    `${faults.length} of the design's ${design.layers.length} layers would get no result: ${shown.join('; ')}${more}`,
  );
}
