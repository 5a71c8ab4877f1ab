import { type Design } from '../design';
import { indexAt } from '../materials';
import { fromNK, growingLayerSignal, type LayerAt } from '../optics';
import { createRng } from './prng';
import { turningPointNearNm } from './turningPointCut';
import { type LayerTruth, type SynthOptions, type SynthRun } from './types';

interface Deposited {
  material: string;
  deltaN: number;
  thicknessNm: number;
}

/** Growable column storage for the generated samples. */
class Columns {
  timeS: number[] = [];
  signal: number[] = [];
  layer: number[] = [];
  chip: number[] = [];
  crystal: number[] = [];
}

/**
 * A synthetic monitor trace of `design` with known truth: per-layer thickness, index, rate and
 * rate drift, detector gain (and its drift), offset, Gaussian noise from a seeded generator,
 * overshoot cuts, rate spikes, chip changes and idle stretches. Deterministic for a given seed.
 * A level cut ends at the design's thickness with a random error (`thicknessScatter`); a
 * turning-point cut where the true signal turns (the true index on the true stack below) past that
 * turning point by a random overshoot, as a controller that cuts once it has seen the turning point.
 */
export function synthesizeRun(design: Design, options: SynthOptions = {}): SynthRun {
  const o = {
    seed: 1, sampleIntervalS: 0.1, noiseFraction: 0.001, gain: 1, gainDriftPerHour: 0, offset: 0, darkS: 0,
    rateNmPerS: {}, defaultRateNmPerS: 0.3, rateScatter: 0.02, rateDriftFraction: 0, indexOffset: {},
    indexDriftPerHour: {}, thicknessScatter: 0.004, turningPointOvershoot: [0.001, 0.006], overshoot: {}, rateSpikes: [], pauses: [], bareChipS: 20, settleS: 3,
    layerColumn: true, chipColumn: true, meta: {}, ...options,
  };
  if (!(o.sampleIntervalS > 0)) throw new RangeError(`sampleIntervalS must be > 0 (got ${o.sampleIntervalS})`);
  const rng = createRng(o.seed);
  const dt = o.sampleIntervalS;
  const cols = new Columns();
  const stacks = new Map<number, Deposited[]>();
  const ripple = (t: number) => (o.ripple ? 1 + o.ripple.fraction * Math.sin(2 * Math.PI * o.ripple.frequencyHz * t) : 1);
  const baseGainAt = (t: number) => o.gain * (1 + (o.gainDriftPerHour * t) / 3600);
  const gainAt = (t: number) => baseGainAt(t) * ripple(t);
  const noise = () => o.noiseFraction * o.gain * rng.normal();
  const push = (layerNo: number, chip: number, value: number, crystal: number) => {
    cols.timeS.push(cols.timeS.length * dt);
    cols.signal.push(value);
    cols.layer.push(layerNo);
    cols.chip.push(chip);
    cols.crystal.push(crystal);
  };
  const nowS = () => cols.timeS.length * dt;
  const stackAt = (chip: number, wavelengthNm: number): LayerAt[] =>
    (stacks.get(chip) ?? []).map((l) => {
      const n = indexAt(design.materials[l.material], wavelengthNm);
      return { n: { re: n.re + l.deltaN, im: n.im }, thicknessNm: l.thicknessNm };
    });
  const idle = (durationS: number, chip: number, wavelengthNm: number, mode: 'R' | 'T') => {
    const m = growingLayerSignal(
      { ambient: indexAt(design.ambient, wavelengthNm), substrate: indexAt(design.substrate, wavelengthNm), below: stackAt(chip, wavelengthNm),
        growing: fromNK(1), wavelengthNm, mode, backside: design.substrateBackside }, [0])[0];
    const count = Math.round(durationS / dt);
    for (let i = 0; i < count; i++) push(0, chip, gainAt(nowS()) * m + o.offset + noise(), 0);
  };

  const truth: LayerTruth[] = [];
  let prevChip = -1;
  for (const layer of design.layers) {
    const { chip, wavelengthNm, mode } = layer.monitor;
    if (cols.timeS.length === 0 && o.darkS > 0) {
      const count = Math.round(o.darkS / dt);
      for (let i = 0; i < count; i++) push(0, chip, o.offset + noise(), 0);
    }
    idle(chip !== prevChip ? o.bareChipS : o.settleS, chip, wavelengthNm, mode);
    prevChip = chip;

    const nominal = indexAt(design.materials[layer.material], wavelengthNm);
    const startS = nowS();
    const deltaN = (o.indexOffset[layer.material] ?? 0) + ((o.indexDriftPerHour[layer.material] ?? 0) * startS) / 3600;
    const growing = { re: nominal.re + deltaN, im: nominal.im };
    // Drawn for every layer, so a run cut only on level keeps its random stream.
    const scatter = o.thicknessScatter * rng.normal();
    const below = stackAt(chip, wavelengthNm);
    const optics = { ambient: indexAt(design.ambient, wavelengthNm), substrate: indexAt(design.substrate, wavelengthNm), below, wavelengthNm, mode, backside: design.substrateBackside };
    const turningPointNm = layer.monitor.cut === 'turning-point'
      ? turningPointNearNm((ds) => growingLayerSignal({ ...optics, growing }, ds), layer.thicknessNm, wavelengthNm / (4 * growing.re))
      : null;
    const late = o.overshoot[layer.layer] ?? 0;
    const [overLo, overHi] = o.turningPointOvershoot;
    const target = turningPointNm !== null
      ? turningPointNm * (1 + overLo + (overHi - overLo) * rng.uniform() + late)
      : layer.thicknessNm * (1 + scatter + late);
    const r = (o.rateNmPerS[layer.material] ?? o.defaultRateNmPerS) * (1 + o.rateScatter * rng.normal());
    const nominalS = target / r;
    const a = (o.rateDriftFraction * r) / nominalS;
    const spikes = o.rateSpikes.filter((s) => s.layer === layer.layer);
    const thickness = (tau: number) => {
      let d = r * tau + 0.5 * a * tau * tau;
      for (const s of spikes) {
        const t0 = s.atFraction * nominalS;
        const overlap = Math.min(Math.max(tau - t0, 0), s.durationS);
        d += (s.factor - 1) * r * overlap;
      }
      return d;
    };
    const d: number[] = [];
    for (let i = 0; ; i++) {
      const di = thickness(i * dt);
      d.push(di);
      if (di >= target || i * dt > 3 * nominalS) break;
    }
    const m = growingLayerSignal({ ...optics, growing }, d);
    const tooling = o.tooling?.[layer.material] ?? 1;
    const pause = o.pauses.find((q) => q.layer === layer.layer);
    const pauseAt = pause ? Math.min(d.length - 1, Math.max(1, Math.round((pause.atFraction * nominalS) / dt))) : -1;
    for (let i = 0; i < d.length; i++) {
      if (i === pauseAt) {
        // Shutter closed: no growth, layer 0, the reading of the layer so far.
        const count = Math.round(pause!.durationS / dt);
        for (let k = 0; k < count; k++) push(0, chip, gainAt(nowS()) * m[i - 1] + o.offset + noise(), d[i - 1] / tooling);
      }
      push(layer.layer, chip, gainAt(nowS()) * m[i] + o.offset + noise(), d[i] / tooling);
    }
    const dEnd = d[d.length - 1];
    const list = stacks.get(chip) ?? [];
    list.push({ material: layer.material, deltaN, thicknessNm: dEnd });
    stacks.set(chip, list);
    truth.push({
      layer: layer.layer, material: layer.material, chip, thicknessNm: dEnd, index: growing.re, nominalIndex: nominal.re,
      rateNmPerS: r, rateDriftNmPerS2: a, startTimeS: startS, endTimeS: cols.timeS[cols.timeS.length - 1], gain: baseGainAt(startS),
      cutErrorQwotPct: ((growing.re * dEnd - nominal.re * layer.thicknessNm) / (wavelengthNm / 4)) * 100,
      qwotAtMonitor: (4 * nominal.re * layer.thicknessNm) / wavelengthNm,
    });
  }
  const last = design.layers[design.layers.length - 1];
  if (last) idle(o.settleS, last.monitor.chip, last.monitor.wavelengthNm, last.monitor.mode);

  return {
    design,
    meta: o.meta,
    timeS: Float64Array.from(cols.timeS),
    signal: Float64Array.from(cols.signal),
    layer: Int32Array.from(cols.layer),
    chip: Int32Array.from(cols.chip),
    crystalNm: o.tooling ? Float64Array.from(cols.crystal) : null,
    truth,
    options,
  };
}
