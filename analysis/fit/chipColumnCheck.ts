import { type Design } from '../design';
import { type TraceData } from '../trace';
import { type LayerSamples } from './layerSamples';

/**
 * Where the trace's `chip` column and the design disagree on where a fresh chip starts: the
 * analysis follows the column (the record of what was done), so a column left at one chip
 * through a chip change puts the later layers on the old chip's stack, and their fits go wild
 * (hr17 mirror with its chip column at 1 throughout: layer 11 read 10⁴× its thickness). One
 * warning per disagreement, naming the layers.
 */
export function chipColumnWarnings(design: Design, trace: TraceData, samplesByLayer: ReadonlyMap<number, LayerSamples>): string[] {
  if (!trace.chip) return [];
  const out: string[] = [];
  const layers = design.layers.filter((l) => samplesByLayer.has(l.layer));
  for (let j = 1; j < layers.length; j++) {
    const [a, b] = [layers[j - 1], layers[j]];
    const designNew = a.monitor.chip !== b.monitor.chip;
    const [ca, cb] = [samplesByLayer.get(a.layer)!.chip, samplesByLayer.get(b.layer)!.chip];
    const traceNew = ca !== cb;
    if (designNew === traceNew) continue;
    out.push(designNew
      ? `the design puts layer ${b.layer} on a fresh chip (${b.monitor.chip}), but the trace's chip column stays at ${cb}: it is analysed on the stack of layers up to ${a.layer}, as the column says; if the chip was changed, the column is wrong`
      : `the trace's chip column changes from ${ca} to ${cb} at layer ${b.layer}, where the design keeps chip ${b.monitor.chip}: it is analysed on a bare chip, as the column says`);
  }
  return out;
}
