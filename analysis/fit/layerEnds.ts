import { type LayerAt } from '../optics';
import { type TraceData } from '../trace';
import { type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { growthFromNext } from './growthFromNext';
import { jointGrowth } from './jointGrowth';
import { growthLogLikelihood, growthPosterior, type GaussianEvidence, type GrowthEstimate, type GrowthEvidence } from './growthPosterior';
import { levelEvidence, settledLevelAfter, startCheck, startLevel, type LevelEvidence, type SettledLevel } from './layerEnd';
import { layerAtWavelength, type FitLayerData, type MonitorOptics } from './layerModel';
import { type Ar1PlusWhite } from '../stats';
import { meanVariance } from './idleNoiseModel';
import { endEquivalentLaw, lawRate, lawThickness, lawTimeToThickness } from './rateWander';
import { type LayerSamples } from './layerSamples';
import { ShutterTime, type ShutterTimeModel } from './shutterTime';
import { type StackCovariance } from './stackUncertainty';

/** What the end of a layer needs of its state (a LayerState's parts); `estimate`, `fit.durationS` and `refit.durationS` are updated. */
export interface EndedLayer {
  design: { layer: number; monitor: { cut: 'turning-point' | 'level' } };
  samples: LayerSamples;
  optics: MonitorOptics;
  nominal: { im: number };
  calibration: { offset: number };
  estimate: LayerEstimate;
  fit: FitLayerData;
  refit: FitLayerData;
}

/** Longest shutter closing time considered, s (the chambers take 0.1–1 s; margin above). */
export const MAX_SHUTTER_S = 2;
/** The layer's last readings that set its curve's local misfit, s. */
const LAST_READINGS_S = 3;
/** A growth counts as determined by the data (and its time joins the run's shutter time) when its σ is below this fraction of the largest growth considered. */
const DETERMINED = 0.1;

interface EndRecord {
  s: EndedLayer;
  chip: number;
  /** Time base at the last logged sample, s. */
  loggedS: number;
  settled: SettledLevel | null;
  level: LevelEvidence | null;
  /** The growth from the next layer's start (or the chip's joint fit), nm, once that layer is fitted: a likelihood on the growth counted from the fitted logged thickness. */
  next: GaussianEvidence | null;
  /** The same as a measure of the true growth (with the logged thickness's own σ), for the run's shutter time. */
  nextAsGrowth: GaussianEvidence | null;
  growth: GrowthEstimate;
}

/**
 * The end of every layer of a run (one instance per analysis, layers in deposition order).
 *
 * The film keeps growing while the shutter closes after the logged cut. Three things in the
 * data tell how much (see layerEnd, growthFromNext, shutterTime): the idle level once the
 * shutter has closed (first order off an extremum, second order at a turning point); the next
 * layer on the chip, whose start on its fringe depends on the stack below (first order even
 * after a turning-point cut); and, for a layer with neither (a turning-point cut, last on its
 * chip), the shutter time the other layers of the run show. Their posterior (growthPosterior)
 * extends the layer's time base, so its thickness and the stack under later layers are the
 * final ones, and its σ reaches the layer's thickness, optical thickness and cut error σ.
 * Each layer is also checked to start where the one below ended (startCheck).
 */
export class LayerEnds {
  private readonly starts: number[];
  private readonly lastOnChip = new Map<number, EndRecord>();
  private readonly records: EndRecord[] = [];
  private readonly shutter: ShutterTime;
  /** Layers whose growth the final joint fit of their chip re-estimated (their σ hold it already). */
  private readonly joint = new WeakSet<EndRecord>();
  private startsDropped = false;
  /** The thickness and optical-thickness σ of an estimate before the growth's σ was added. */
  private readonly baseSigma = new WeakMap<LayerEstimate, { d: number; nd: number }>();

  /**
   * `noise`: the detector's white + AR(1) noise from the idle stretches (idleNoiseModel); it sets
   * a floor under the σ of the start check's two levels and of a level cut's settled level and
   * last readings (its growth's evidence), which their own few readings, spanning about one
   * correlation time, underestimate. `shutterTimeGrowth`: AnalyzeOptions.shutterTimeGrowth;
   * `levelGrowthFromNext`: AnalyzeOptions.levelGrowthFromNext.
   */
  constructor(
    private readonly trace: TraceData, samplesByLayer: ReadonlyMap<number, LayerSamples>, private readonly warnings: string[],
    private readonly noise: Ar1PlusWhite | null = null, private readonly shutterTimeGrowth: 'bounded' | 'run-mean' = 'bounded',
    private readonly levelGrowthFromNext = false, shutterTimeModel: ShutterTimeModel = 'normal',
  ) {
    this.shutter = new ShutterTime(shutterTimeModel, MAX_SHUTTER_S);
    this.starts = [...samplesByLayer.values()].map((s) => s.indices[0]).sort((a, b) => a - b);
  }

  /** After a layer's own fit: checks its start against the layer below, reads its settled level and sets a first estimate of its growth. */
  ended(s: EndedLayer, below: readonly LayerAt[]): void {
    const { samples } = s;
    const { signal } = this.trace;
    const n = samples.indices.length;
    const previous = this.lastOnChip.get(samples.chip);
    if (previous?.settled) {
      const count = Math.min(n, 40);
      const start = startLevel(samples.tauS.subarray(0, count), Array.from({ length: count }, (_, i) => signal[samples.indices[i]]));
      const note = start ? startCheck(s.design.layer, previous.s.design.layer, this.withNoiseFloor(previous.settled, 1), this.withNoiseFloor(start, (4 * start.samples - 2) / (start.samples + 1))) : null;
      if (note) this.warnings.push(note);
    }
    const lastIndex = samples.indices[n - 1];
    const nextStart = this.starts.find((i) => i > lastIndex) ?? signal.length;
    const settled = settledLevelAfter(signal, lastIndex + 1, nextStart);
    const loggedS = s.fit.durationS;
    const rec: EndRecord = { s, chip: samples.chip, loggedS, settled, level: null, next: null, nextAsGrowth: null, growth: { deltaNm: 0, sigmaNm: 0 } };
    const e = s.estimate;
    // The level is read after a level cut, where the curve still slopes and the level tells the
    // growth to first order; at a turning point it tells it only to second order, through the
    // curve's curvature, which any misfit of the model (an offset, a gain) bends.
    if (settled && n >= 10 && s.design.monitor.cut === 'level') {
      let k = n - 1;
      while (k > 0 && n - k < 10) k--;
      while (k > 0 && samples.tauS[n - 1] - samples.tauS[k - 1] <= LAST_READINGS_S) k--;
      // Both means floored by the run's noise: their own scatter over a few seconds of correlated
      // noise told σ a few times too small, and a growth read 0.15–0.6 nm where none grew moved
      // the layer on it ('R monitoring with an offset', refit, seeds 64–65: layer 5's index
      // 3.5σ, 3.6σ off; tests/chamber/__tests__/levelGrowthNoise.test.ts).
      rec.level = levelEvidence({
        settled: this.withNoiseFloor(settled, 1), optics: s.optics, below, index: e.index, extinction: -s.nominal.im, ...endEquivalentLaw(e, s.fit.wander, loggedS),
        durationS: loggedS, gain: e.gain, offset: s.calibration.offset,
        lastReadings: Array.from({ length: n - k }, (_, i) => signal[samples.indices[k + i]]), lastTauS: samples.tauS.subarray(k),
        ...(this.noise ? { meanSigmaFloor: (m: number) => Math.sqrt(meanVariance(this.noise!, m)) } : {}),
      });
      if (offCurve(this.evidence(rec, false, false))) {
        this.warnings.push(`layer ${s.design.layer}: the idle reading after the cut (${settled.level.toFixed(4)}) is not on the layer's modelled curve within ${MAX_SHUTTER_S} s of further growth; the growth after the cut is not read from it`);
        rec.level = null;
      }
    }
    this.records.push(rec);
    this.lastOnChip.set(samples.chip, rec);
    this.update(rec);
  }

  /**
   * A level's σ no smaller than the run's noise allows for a mean of its samples (meanVariance);
   * `factor` > 1 for a straight line's intercept at its first sample ((4m − 2)/(m + 1) for white
   * noise, from the variance of a least-squares intercept).
   */
  private withNoiseFloor<T extends { sigma: number; samples: number }>(level: T, factor: number): T {
    if (!this.noise) return level;
    const floor = Math.sqrt(meanVariance(this.noise, level.samples) * factor);
    return Number.isFinite(floor) && floor > level.sigma ? { ...level, sigma: floor } : level;
  }

  /**
   * After a layer's fit on a chip with a layer below: the growth of the layer below from this
   * layer's start (growthFromNext), combined with that layer's idle level. Updates the layer
   * below (its time base, estimate and σ) and its entry in `below`; true when it moved enough
   * that this layer should be fitted again on the new stack.
   */
  fromNext(chip: number, below: LayerAt[], layer: FitLayerData, result: JointFitResult, offsetSignal: number, gainPriorWeight: number, stack?: StackCovariance): boolean {
    const rec = this.lastOnChip.get(chip);
    // Read only after a cut at a turning point, where the idle level cannot tell the growth (after
    // a level cut it can, to first order); and not across a held index (a thin layer, below or
    // here), which leaves the stack too loosely known.
    if (!rec || below.length === 0 || rec.s.design.monitor.cut !== 'turning-point' || rec.s.fit.heldIndex !== null || layer.heldIndex !== null) return false;
    const g = growthFromNext({
      below, layer, params: result.solver.params, offsetSignal, gainPriorWeight,
      residualVariance: result.solver.ssr / Math.max(result.solver.dof, 1), noiseCorrelation: result.layers[0].noiseCorrelation,
      ...(stack ? { stack } : {}),
    });
    if (!g || !Number.isFinite(g.deltaNm) || !(g.sigmaNm > 0)) return false;
    // The next layer tells the final thickness; as a measure of the true growth it also carries
    // the error of the thickness at the last logged sample (the layer's own σ).
    rec.next = { meanNm: rec.growth.deltaNm + g.deltaNm, sigmaNm: g.sigmaNm };
    rec.nextAsGrowth = Number.isFinite(this.base(rec).d) ? { meanNm: rec.next.meanNm, sigmaNm: Math.hypot(g.sigmaNm, this.base(rec).d) } : null;
    // A growth well outside [0, the longest shutter] is no growth but a misfit (the model, the
    // stack or the detector offset): the start is then not read.
    const check = rec.nextAsGrowth ?? rec.next;
    const maxNm = finalRate(rec.loggedS, rec.s) * MAX_SHUTTER_S;
    if (check.meanNm < -3 * check.sigmaNm || check.meanNm > maxNm + 3 * check.sigmaNm) {
      rec.next = rec.nextAsGrowth = null;
      return false;
    }
    const before = rec.growth.deltaNm;
    const growth = this.update(rec);
    below[below.length - 1] = layerAtWavelength(rec.s.fit, rec.s.estimate, layer.optics.wavelengthNm);
    return Math.abs(growth.deltaNm - before) > 0.25 * Math.max(growth.sigmaNm, 1e-6);
  }

  /**
   * The growth after the cut of the chip's last layer as it stands, and the rate it grew at,
   * where the next layer's start can tell it (a turning-point cut, its index fitted); else null.
   */
  growthBelow(chip: number): { deltaNm: number; rateNmPerS: number } | null {
    const rec = this.lastOnChip.get(chip);
    if (!rec || rec.s.design.monitor.cut !== 'turning-point' || rec.s.fit.heldIndex !== null) return null;
    return { deltaNm: rec.growth.deltaNm, rateNmPerS: finalRate(rec.loggedS, rec.s) };
  }

  /**
   * The time base at the layer's last logged sample, s, and the σ of its fitted thickness there
   * (before the growth's σ took its place); null for a layer not ended here.
   */
  loggedCut(s: EndedLayer): { loggedS: number; sigmaNm: number } | null {
    const rec = this.records.find((r) => r.s === s);
    return rec ? { loggedS: rec.loggedS, sigmaNm: this.base(rec).d } : null;
  }

  /** The chip's stack covariance (sequential fits) with the growth's variance added to the thickness of its top layer. */
  stackWithGrowth(chip: number, stack: StackCovariance): StackCovariance {
    const rec = this.lastOnChip.get(chip);
    if (!rec || stack.size === 0) return stack;
    const sigma = rec.s.estimate.thicknessSigmaNm;
    if (!Number.isFinite(sigma)) return stack;
    const cov = Float64Array.from(stack.cov);
    cov[stack.size * stack.size - 1] = sigma ** 2;
    return { size: stack.size, cov };
  }

  /**
   * Before a chip's final joint fit (refit): no layer whose growth the next layer's start read
   * ends before its last logged sample. That reading is counted from the pass's fitted thickness
   * at the last logged sample, and comes out below 0 where that fit overestimated it (the
   * posterior on the final thickness, growthPosterior's smoothNm); the joint fit re-estimates
   * that thickness, and a time base left short would put the layer's end, and the stack under
   * the next layer, below what its own curve shows (chamber mirror, correlated noise, seed 15:
   * layer 11's end 2 s short, −0.54 %, the layer above it +1.35 % to make up for it, where the
   * joint re-reading of the growth was refused). The end goes to the last logged sample (growth
   * 0) and the joint fit's re-reading (afterJointFit) starts from there.
   */
  beforeJointFit(states: readonly EndedLayer[]): void {
    for (const s of states) {
      const rec = this.records.find((r) => r.s === s);
      if (!rec?.next || !(rec.growth.deltaNm < 0)) continue;
      rec.growth = { deltaNm: 0, sigmaNm: rec.growth.sigmaNm };
      s.fit.durationS = s.refit.durationS = rec.loggedS;
    }
  }

  /**
   * After a chip's final joint fit (refit): every growth but the chip's last re-read against
   * the jointly fitted stack (jointGrowth), the layers' estimates and σ with it. With
   * `levelGrowthFromNext`, a level cut's growth too where the next layer is a turning-point cut
   * (readLevelFromNext); where the step with every growth fails jointGrowth's safeguard, a step
   * with those level cuts alone.
   */
  afterJointFit(data: readonly FitLayerData[], states: readonly EndedLayer[], offsetSignal: number, sharedGain: SharedGain | null): void {
    if (!this.startsConsistent()) return;
    const recs = states.map((s) => this.records.find((r) => r.s === s) ?? null);
    const level = recs.map((r, j) => r !== null && this.readLevelFromNext(r, states[j + 1]));
    const step = (grown: (r: EndRecord, j: number) => boolean) => jointGrowth({
      data, estimates: states.map((s) => s.estimate), sharedGain, offsetSignal,
      growth: recs.map((r, j) => (r && grown(r, j) && j + 1 < states.length ? { loggedS: r.loggedS, deltaNm: r.growth.deltaNm } : null)),
      finalize: (j, joint) => {
        const rec = recs[j]!;
        rec.next = rec.nextAsGrowth = joint;
        this.record(rec);
        return growthPosterior(this.evidence(rec, true, false));
      },
    });
    let out = step((r, j) => r.next !== null || level[j]);
    // (a failed step leaves each level cut's reading as a stale start, dropped in finish like any other)
    if (!out && level.some(Boolean)) out = step((_, j) => level[j]);
    if (!out) return;
    out.forEach((o, j) => {
      const s = states[j];
      s.estimate = o.estimate;
      s.fit.durationS = s.refit.durationS = o.durationS;
      const rec = recs[j];
      if (rec && o.growth) {
        rec.growth = o.growth;
        this.joint.add(rec);
      }
    });
  }

  /**
   * After a chip's final joint fit and its re-reading of the growths (afterJointFit, refit): for
   * each layer but the chip's last, the growth after its cut as that fit held it where no later
   * reading told it (a level cut whose next layer is cut on level, or across a held index: its
   * idle level or the run's shutter time alone), its σ beyond the logged thickness's own (which
   * the joint fit's covariance holds already) as the time it adds to the layer's time base, s.
   * The layers above such a cut stand on it, and the joint fit took it as exact. Null where the
   * growth was read jointly, or from the next layer's start (that layer's own readings told it,
   * and the fit of that layer on them already carries their noise), or adds no σ.
   */
  heldGrowths(states: readonly EndedLayer[]): (number | null)[] {
    return states.map((s, j) => {
      const rec = j + 1 < states.length ? this.records.find((r) => r.s === s) : undefined;
      if (!rec || this.joint.has(rec) || rec.next) return null;
      const sigmaNm = Math.sqrt(Math.max(0, rec.growth.sigmaNm ** 2 - this.base(rec).d ** 2));
      if (!(sigmaNm > 0) || !Number.isFinite(sigmaNm)) return null;
      return sigmaNm / finalRate(s.fit.durationS, s);
    });
  }

  /**
   * Whether a level cut's growth is read from the next layer's start in the chip's joint fit
   * (AnalyzeOptions.levelGrowthFromNext). The idle level after the cut reads it too, but over a
   * few seconds of correlated noise, to ±0.1–0.3 nm (R with an offset), and its posterior under
   * the bound δ ≥ 0 stands above a growth of 0. The next layer's start reads it as it does after
   * a turning-point cut, to first order where that layer starts on the cut's slope; but only
   * where that start's ramp as the shutter opens is modelled (a turning-point cut, the start
   * transient): a next layer cut on level, whose start-up is not, reads that ramp as growth. Not
   * across a held index (as fromNext).
   */
  private readLevelFromNext(rec: EndRecord, next: EndedLayer | undefined): boolean {
    return this.levelGrowthFromNext && rec.s.design.monitor.cut === 'level' && rec.next === null && next !== undefined
      && next.design.monitor.cut === 'turning-point' && next.samples.chip === rec.chip && rec.s.fit.heldIndex === null && next.fit.heldIndex === null;
  }

  /**
   * After the pass (and, in refit, after the final joint fits): a layer with no next layer
   * takes the run's shutter time; with `jointEstimates` (refit, whose final fits replaced
   * every estimate) the growth's σ is added where the joint step did not already.
   */
  finish(jointEstimates: boolean): void {
    this.startsConsistent();
    for (const rec of this.records) {
      if (this.joint.has(rec)) continue;
      // After a joint fit that did not re-read it, the start read in the pass is stale (counted
      // from that pass's thickness): the growth stands on its level and the shutter time only.
      const stale = jointEstimates && rec.next !== null;
      if (stale) rec.next = null;
      this.update(rec, stale, true);
    }
  }

  /**
   * Whether the layers' starts, read as growth after the cuts below them, agree with a growth
   * that is not negative: across the run their mean time (weighted, its σ no smaller than their
   * scatter allows) may not lie more than 3σ below 0. When it does, the model does not follow
   * the stack (a detector offset, a wrong index or gain bends every curve alike) and no start is
   * read: the evidence is dropped, with a warning (once).
   */
  private startsConsistent(): boolean {
    if (this.startsDropped) return false;
    const t = this.records.filter((r) => r.nextAsGrowth).map((r) => {
      const rate = finalRate(r.loggedS, r.s);
      return { t: r.nextAsGrowth!.meanNm / rate, s: r.nextAsGrowth!.sigmaNm / rate };
    });
    if (t.length < 3) return true;
    let sw = 0, swt = 0;
    for (const x of t) {
      sw += 1 / (x.s * x.s);
      swt += x.t / (x.s * x.s);
    }
    const mean = swt / sw;
    const scatter = t.reduce((a, x) => a + (x.t - mean) ** 2, 0) / (t.length - 1);
    const sigma = Math.max(1 / Math.sqrt(sw), Math.sqrt(scatter / t.length));
    if (mean + 3 * sigma >= 0) return true;
    this.startsDropped = true;
    this.warnings.push(`the layers' starts read as growth after the cuts below them give a negative shutter time (${mean.toFixed(2)} ± ${sigma.toFixed(2)} s over ${t.length} layers): ` +
      'the model does not follow the stack (a detector offset, index or gain?); the growth after each cut is taken from the idle levels and the shutter time only');
    for (const r of this.records) {
      if (!r.nextAsGrowth && !r.next) continue;
      r.next = r.nextAsGrowth = null;
      this.shutter.remove(r.s.design.layer);
    }
    for (const r of this.records) this.record(r);
    return false;
  }

  /**
   * A layer's growth from all its evidence: its idle level, the next layer's start (when
   * fitted), and the run's shutter time (the other layers); with none of these, none is added
   * and its possible size goes into σ (the level posterior's root-mean-square distance from 0).
   */
  private update(rec: EndRecord, keepTime = false, final = false): GrowthEstimate {
    this.record(rec);
    const e = this.evidence(rec);
    let growth = growthPosterior(e);
    if (this.shutterTimeGrowth === 'run-mean' && !this.shutter.truncated && final && !keepTime && !rec.level && !e.gaussians?.length && e.prior) {
      // Told by the run's shutter time alone, once the pass is over: its prediction as it stands.
      // Cut to [0, max] the mean stands about 0.8σ above a time of 0 whatever the readings say
      // (AnalyzeOptions.shutterTimeGrowth). The pass keeps the bounded mean: its next layer reads
      // the growth from there, and a run on the edge of its fit (synthetic reflectance run with an
      // absorbing film) took a different way through it.
      growth = { deltaNm: e.prior.meanNm, sigmaNm: Math.hypot(e.prior.sigmaNm, e.smoothNm ?? 0) };
    } else if (!e.gaussians?.length && !e.prior && !e.population) {
      const own = growthPosterior(this.evidence(rec, false, false));
      // Nothing but a level that does not determine it: no growth added, its size into σ.
      if (!determines(own, e.maxNm)) growth = { deltaNm: 0, sigmaNm: Math.hypot(own.deltaNm, own.sigmaNm, e.smoothNm ?? 0) };
    }
    this.apply(rec, growth, keepTime);
    return growth;
  }

  /** The thickness and optical-thickness σ of the layer's estimate before the growth. */
  private base(rec: EndRecord): { d: number; nd: number } {
    const e = rec.s.estimate;
    return this.baseSigma.get(e) ?? { d: e.thicknessSigmaNm, nd: e.opticalThicknessSigmaNm };
  }

  /**
   * The evidence on a layer's growth. The idle level and the run's shutter time are on the true
   * growth (the level is read against the layer's last readings, whatever the fitted logged
   * thickness); the next layer's start is on the final thickness. Counted from the fitted
   * logged thickness (`smeared`, the sequential reading), the first two are folded into one
   * Gaussian prior and smeared by that thickness's σ (growthPosterior's smoothNm); a joint fit's
   * growth parameter (`smeared` false) is the true growth itself.
   */
  private evidence(rec: EndRecord, withShutter = true, smeared = true): GrowthEvidence {
    const rate = finalRate(rec.loggedS, rec.s);
    const maxNm = rate * MAX_SHUTTER_S;
    const t = withShutter ? this.shutter.predict(rec.s.design.layer) : null;
    const pool = t ? { meanNm: rate * t.timeS, sigmaNm: Math.max(rate * t.sigmaS, 1e-6) } : null;
    // 'mixture': the population itself, each component cut at 0 on its own (growthPosterior).
    const population = t?.population?.map((c) => ({ meanNm: rate * c.meanNm, sigmaNm: Math.max(rate * c.sigmaNm, 1e-6), weight: c.weight }));
    const popPrior = population ? { population } : pool ? { prior: pool } : {};
    const level = rec.level ? { predict: rec.level.predict, observed: rec.level.settled.level, sigma: rec.level.sigma, sigmaPerNm: rec.level.sigmaPerNm } : null;
    const gaussians = rec.next ? [rec.next] : [];
    const smooth = this.base(rec).d;
    if (!smeared || !Number.isFinite(smooth)) return { maxNm, gaussians, ...popPrior, ...(level ? { level } : {}) };
    if (level) {
      const own = growthPosterior({ maxNm, level, ...popPrior });
      if (pool || determines(own, maxNm)) return { maxNm, gaussians, prior: { meanNm: own.deltaNm, sigmaNm: Math.max(own.sigmaNm, 1e-6) }, smoothNm: smooth };
    }
    return { maxNm, gaussians, ...popPrior, smoothNm: smooth };
  }

  /**
   * The layer's own estimate of its growth joins the run's shutter time: the next layer's
   * (unbounded, so that noise about a growth of 0 averages out), else its level's when that
   * determines it; a layer with neither leaves it.
   */
  private record(rec: EndRecord): void {
    const rate = finalRate(rec.loggedS, rec.s);
    const layer = rec.s.design.layer;
    let own: GaussianEvidence | null = rec.nextAsGrowth;
    if (!own && rec.level) {
      const p = growthPosterior(this.evidence(rec, false, false));
      if (determines(p, rate * MAX_SHUTTER_S)) own = { meanNm: p.deltaNm, sigmaNm: p.sigmaNm };
    }
    if (own) this.shutter.add(layer, own.meanNm / rate, own.sigmaNm / rate);
    else this.shutter.remove(layer);
  }

  /** The growth into the layer's time base (unless `keepTime`), thickness and σ. */
  private apply(rec: EndRecord, growth: GrowthEstimate, keepTime = false): void {
    if (!Number.isFinite(growth.deltaNm)) return;
    rec.growth = growth;
    const { s } = rec;
    const e = s.estimate;
    const base = this.base(rec);
    if (!keepTime) {
      const loggedNm = lawThickness(e, s.fit.wander, rec.loggedS);
      const T = growth.deltaNm !== 0 ? lawTimeToThickness(e, s.fit.wander, loggedNm + growth.deltaNm, rec.loggedS) : rec.loggedS;
      s.fit.durationS = s.refit.durationS = Number.isFinite(T) ? T : rec.loggedS + growth.deltaNm / finalRate(rec.loggedS, s);
    }
    const d = lawThickness(e, s.fit.wander, s.fit.durationS);
    // The growth's σ is that of the final thickness (see growthPosterior's smoothNm): it takes
    // the place of the logged thickness's σ, in n·d too (where the index's correlation with the
    // logged thickness made n·d the better known, no less than n·σ of the final thickness).
    const n = e.index;
    const varND = Math.max(base.nd ** 2 + n * n * (growth.sigmaNm ** 2 - base.d ** 2), (n * growth.sigmaNm) ** 2);
    const next: LayerEstimate = {
      ...e, thicknessNm: d, opticalThicknessNm: n * d, thicknessSigmaNm: growth.sigmaNm, opticalThicknessSigmaNm: Math.sqrt(varND),
    };
    this.baseSigma.set(next, base);
    s.estimate = next;
  }
}

/**
 * An idle level determines the growth when its posterior is narrow against the largest growth
 * considered and shows a growth (more than 2σ above 0): a level consistent with none adds none
 * (the posterior mean under the bound at 0 would add about 0.8σ where nothing grew).
 */
const determines = (g: GrowthEstimate, maxNm: number) => g.sigmaNm < DETERMINED * maxNm && g.deltaNm > 2 * g.sigmaNm;

/** The rate at τ = T by the layer's whole thickness law (its wander too). */
const finalRate = (T: number, s: { estimate: LayerEstimate; fit: FitLayerData }) => Math.max(lawRate(s.estimate, s.fit.wander, T), 1e-9);

/** The level lies more than 5σ from the curve for every growth considered. */
function offCurve(e: GrowthEvidence): boolean {
  if (!e.level) return false;
  const d = Float64Array.from({ length: 401 }, (_, i) => (e.maxNm * i) / 400);
  const ll = growthLogLikelihood({ maxNm: e.maxNm, level: e.level }, d);
  return Math.max(...ll) < -12.5;
}
