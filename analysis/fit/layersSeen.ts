import { type Design, type DesignLayer, monitorCurve } from '../design';
import { type TraceData } from '../trace';
import { AnalysisInputError } from './AnalysisInputError';
import { type ChipStart } from './chipCalibrations';
import { type LayerSamples } from './layerSamples';

/** The design's swing must stand this many noise σ above the noise for a flat reading to mean anything. */
const EXPECTED_SWING_SIGMAS = 20;
/**
 * A layer's readings count as flat when their 2–98 % range is within this many noise σ: pure
 * normal noise spans about 4.1σ there (the normal's 98 % point is 2.05σ, from memory), and
 * correlated noise or a drift only widens it, so a flat verdict errs towards "seen".
 */
const FLAT_RANGE_SIGMAS = 6;

export interface UnseenLayers {
  /** Design layers at fault. */
  layers: number[];
  why: string;
  /** The chip at fault, where the fault is the chip's (its layers all share it). */
  chip?: number;
}

/**
 * The layers whose growth the monitor did not see: a chip whose readings carry no light above
 * its offset (a gain ≤ 0: no lamp, the wrong channel, an inverted sign), or a layer the design
 * expects to move the reading by many times the noise whose readings stayed within the noise
 * (no light on the detector, a monitor shutter left closed, nothing deposited). Fitting such a
 * layer returns a thickness read from nothing, with σ from the model's shape rather than the data.
 */
export function unseenLayers(
  design: Design, trace: TraceData, order: readonly DesignLayer[], samplesByLayer: ReadonlyMap<number, LayerSamples>, chips: ReadonlyMap<number, ChipStart>,
): UnseenLayers[] {
  const out: UnseenLayers[] = [];
  const dark = new Map<number, UnseenLayers>();
  // Layers whose readings did not change at all (a constant logged in place of the signal): one entry.
  let still: (UnseenLayers & { swings: number[] }) | null = null;
  for (const dl of order) {
    const s = samplesByLayer.get(dl.layer);
    const start = s && chips.get(s.chip);
    if (!s || !start) continue;
    const { gain, offset, noiseSigma, source, bareLevel } = start.calibration;
    if (!(gain > 0) || !Number.isFinite(gain)) {
      const seen = dark.get(s.chip);
      if (seen) {
        seen.layers.push(dl.layer);
        continue;
      }
      const from = source === 'bare-chip' ? `the bare chip's reading ${fmt(bareLevel ?? NaN)}` : `layer ${dl.layer}'s first readings`;
      const fault: UnseenLayers = { layers: [dl.layer], why: '', chip: s.chip };
      fault.why = `its readings carry no light above the offset (gain ${fmt(gain)} from ${from}, offset ${fmt(offset)}): no light reached the detector, the wrong channel was logged, or its sign is inverted`;
      dark.set(s.chip, fault);
      out.push(fault);
      continue;
    }
    const expected = gain * modelledSwing(design, dl);
    const observed = spread(trace.signal, s.indices);
    if (!(expected >= EXPECTED_SWING_SIGMAS * noiseSigma) || observed > FLAT_RANGE_SIGMAS * noiseSigma) continue;
    if (observed > 0) {
      const moved = `its readings stayed within the noise while it grew (2–98 % range ${fmt(observed)}, ${fmt(observed / noiseSigma)}× the noise σ ${fmt(noiseSigma)})`;
      out.push({ layers: [dl.layer], why: `${moved}, where the design expects a swing of ${fmt(expected)}: no light on the detector, or nothing was deposited` });
      continue;
    }
    if (!still) {
      still = { layers: [], why: '', swings: [] };
      out.push(still);
    }
    still.layers.push(dl.layer);
    still.swings.push(expected);
  }
  if (still) {
    const [lo, hi] = [Math.min(...still.swings), Math.max(...still.swings)];
    const one = still.layers.length === 1;
    still.why = `${one ? 'its readings' : 'their readings'} did not change at all while ${one ? 'it' : 'they'} grew, where the design expects ${one ? `a swing of ${fmt(lo)}` : `swings of ${fmt(lo)}–${fmt(hi)}`}: no light on the detector, or nothing was deposited`;
  }
  return out.map(({ layers, why, chip }) => (chip === undefined ? { layers, why } : { layers, why, chip }));
}

/** Throws, naming every layer unseenLayers finds. */
export function assertLayersSeen(...args: Parameters<typeof unseenLayers>): void {
  const faults = unseenLayers(...args);
  if (faults.length === 0) return;
  const design = args[0];
  const layers = faults.flatMap((f) => f.layers);
  const name = (ls: number[]) => `layer${ls.length > 1 ? 's' : ''} ${ls.join(', ')} (${ls.map((l) => design.layers[l - 1].material).join(', ')})`;
  const label = (f: UnseenLayers) => (f.chip !== undefined ? `chip ${f.chip} (layer${f.layers.length > 1 ? 's' : ''} ${f.layers.join(', ')})` : name(f.layers));
  const shown = faults.slice(0, 10).map((f) => `${label(f)}: ${f.why}`);
  const more = faults.length > 10 ? `; and ${faults.length - 10} more` : '';
  throw new AnalysisInputError(
    'layer_not_seen', layers,
    `the monitor did not see ${layers.length} of the design's ${design.layers.length} layers grow: ${shown.join('; ')}${more}`,
  );
}

/** Range of the modelled monitor signal over the layer's design growth, on its chip's design stack. */
function modelledSwing(design: Design, dl: DesignLayer): number {
  const d = Float64Array.from({ length: 97 }, (_, i) => (dl.thicknessNm * i) / 96);
  let lo = Infinity, hi = -Infinity;
  for (const v of monitorCurve(design, dl.layer, d, { pol: 's' })) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return hi - lo;
}

/** Readings the 2–98 % range is read from, at most: evenly spaced through the layer (a 40-layer, 8·10⁵-sample run sorted whole took 0.1 s a pass). */
const SPREAD_SAMPLES = 2048;

/** The 2–98 % range of the readings at these indices (a few spikes left out), from at most SPREAD_SAMPLES of them. */
function spread(signal: ArrayLike<number>, indices: Int32Array): number {
  const n = Math.min(indices.length, SPREAD_SAMPLES);
  const v = new Float64Array(n);
  for (let k = 0; k < n; k++) v[k] = signal[indices[Math.floor((k * indices.length) / n)]];
  v.sort();
  const at = (p: number) => v[Math.min(n - 1, Math.max(0, Math.round(p * (n - 1))))];
  return at(0.98) - at(0.02);
}

const fmt = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(3)).toString() : String(x));
