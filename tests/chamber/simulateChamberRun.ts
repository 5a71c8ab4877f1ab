import { monitorBand, type BandNode } from './band';
import { ChipStacks, type Sublayer } from './chipStacks';
import { levelCutThickness, turningPointThickness } from './cutPlan';
import { type ChamberDesign, designThicknessNm, dispersion } from './design';
import { Detector } from './detector';
import { type ChamberOptions, type ChamberRun, type ChipTruth, type LayerTruth } from './options';
import { chamberRng } from './rng';
import { identity, layerMatrix, mul, response, stackMatrices } from './thinFilm';
import { Samples } from './samples';

const SLAB_NM = 2;

function resolve(o: ChamberOptions) {
  return {
    seed: 1, sampleIntervalS: 0.1, meta: {}, gain: 1, lampDriftPerHour: 0, darkOffset: 0, strayFraction: 0, darkS: 0, whiteNoise: 0.0005,
    jitterFraction: 0, rateNmPerS: {}, defaultRateNmPerS: 0.3, rateScatter: 0.02, rampS: 0, rateDriftFraction: 0, rateSpikes: [], indexOffset: {}, indexDriftPerHour: {},
    indexWithinLayer: {}, indexScatter: 0, turningPointOvershoot: { meanPct: 0, sigmaPct: 0 }, levelLatencyS: [0, 0] as [number, number],
    overshoot: {}, shutterCloseS: [0, 0] as [number, number], bareChipS: 20, settleS: 3, ...o,
    columns: { layer: o.columns?.layer ?? true, chip: o.columns?.chip ?? true, reference: o.columns?.reference ?? true },
  };
}

/**
 * A monitor trace of `design` as a real chamber logs it, with the truth of what was deposited.
 * Every sample is the characteristic-matrix product of the whole stack on the chip (the growing
 * film as slabs of the index it had when each was deposited). Deterministic for a seed; each
 * effect draws from its own stream, so switching one off leaves the others as they were.
 */
export function simulateChamberRun(design: ChamberDesign, options: ChamberOptions = {}): ChamberRun {
  const o = resolve(options);
  const dt = o.sampleIntervalS;
  if (!(dt > 0)) throw new RangeError(`sampleIntervalS must be > 0 (got ${dt})`);
  if (!(o.jitterFraction >= 0 && o.jitterFraction < 0.5)) throw new RangeError('jitterFraction must be in [0, 0.5)');
  if (o.reference && o.darkS > 0) throw new RangeError('a reference detector with lamp-off samples (darkS) is not modelled');
  const root = chamberRng(o.seed);
  const rngLayer = root.fork('layers'), rngWander = root.fork('rate-wander'), rngJitter = root.fork('jitter'), rngTiming = root.fork('timing');
  const det = new Detector(o, dt, root.fork('white'), root.fork('correlated'), root.fork('spikes'), root.fork('ripple-wander'));
  const stacks = new ChipStacks(design);
  const out = new Samples(o.tooling !== undefined, o.reference !== undefined);
  // the reference detector's own noise, on its own stream: the signal's draws stay as they were
  const rngReference = root.fork('reference');
  const referenceAt = (t: number) => (o.reference ? o.reference.gain * det.lampAt(t) * (1 + o.reference.whiteNoise * rngReference.gauss()) : 0);
  const tNow = () => out.length * dt;
  const push = (fraction: number, layer: number, chip: number, crystal: number, lampOn = true) => {
    const t = tNow();
    out.push(t + o.jitterFraction * dt * (2 * rngJitter.next() - 1), det.reading(fraction, t, lampOn), fraction, layer, chip, crystal, referenceAt(t));
  };
  const hold = (seconds: number, fraction: (s: number) => number, chip: number, lampOn = true) => {
    const count = Math.round(seconds / dt);
    for (let i = 0; i < count; i++) push(fraction(i / Math.max(count - 1, 1)), 0, chip, 0, lampOn);
  };
  const layers: LayerTruth[] = [];
  const chips: ChipTruth[] = [];
  const designOnChip = new Map<number, { material: string; thicknessNm: number }[]>();
  let prev: { chip: number; band: BandNode[]; mode: 'R' | 'T' } | null = null;

  for (const [li, dl] of design.layers.entries()) {
    const layerNo = li + 1;
    const { chip, wavelengthNm: wl, mode } = dl.monitor;
    const material = dl.material;
    const dDesign = designThicknessNm(design, dl);
    const media = stacks.media(wl);
    // the wavelengths the detector averages over (option bandwidthNm; the monitor wavelength alone by default)
    const band = monitorBand(wl, o.bandwidthNm);
    if (!prev || prev.chip !== chip) {
      if (!prev && o.darkS > 0) hold(o.darkS, () => 0, chip, false);
      if (prev && o.chipChange) {
        const old = stacks.bandLevel(prev.chip, band, mode);
        const bare = stacks.bandLevel(chip, band, mode);
        hold(rngTiming.between(...o.chipChange.oldLevelS), () => old, chip);
        // the holder turns: the old chip leaves the beam, nothing, then the new chip arrives
        hold(rngTiming.between(...o.chipChange.darkS), (s) => (s < 0.3 ? old * (1 - s / 0.3) : s > 0.7 ? (bare * (s - 0.7)) / 0.3 : 0), chip);
      }
      chips.push({ chip, gain: NaN, offset: NaN, bareFromS: tNow() });
      hold(o.bareChipS, () => stacks.bandLevel(chip, band, mode), chip);
    } else {
      const level = stacks.bandLevel(chip, band, mode);
      hold(o.settleS, () => level, chip);
    }
    prev = { chip, band, mode };

    const startS = tNow();

    const chipTruth = chips[chips.length - 1];
    if (Number.isNaN(chipTruth.gain)) {
      chipTruth.gain = det.gainAt(startS);
      chipTruth.offset = det.offsetAt(startS);
    }
    const nominal = dispersion(design.materials[material], wl);
    const base = nominal.n + (o.indexOffset[material] ?? 0) + ((o.indexDriftPerHour[material] ?? 0) * startS) / 3600 + o.indexScatter * rngLayer.gauss();
    const grade = o.indexWithinLayer[material] ?? 0;
    const below = stacks.matrices(chip, wl);
    const designBelow = (designOnChip.get(chip) ?? []).map((l) => {
      const nk = dispersion(design.materials[l.material], wl);
      return { n: nk.n, k: nk.k, thicknessNm: l.thicknessNm };
    });
    // per wavelength of the band: the stack below, the media, the growing film's index (its
    // deviation from the material's dispersion the same at every wavelength, as for the slabs)
    const channels = band.length === 1 ? null : band.map((b) => {
      const nk = dispersion(design.materials[material], b.wavelengthNm);
      return { ...b, media: stacks.media(b.wavelengthNm), below: stacks.matrices(chip, b.wavelengthNm), dn: nk.n - nominal.n, k: nk.k, G: identity(), Gr: identity() };
    });
    let dCut: number;
    const truthCurve = {
      below, media, mode, n: base, k: nominal.k, wavelengthNm: wl,
      band: channels?.map((c) => ({ below: c.below, media: c.media, n: base + c.dn, k: c.k, wavelengthNm: c.wavelengthNm, weight: c.weight })),
    };
    if (dl.monitor.cut === 'turning-point') {
      const pct = Math.max(0, o.turningPointOvershoot.meanPct + o.turningPointOvershoot.sigmaPct * rngLayer.gauss());
      dCut = turningPointThickness(truthCurve, dDesign) * (1 + pct / 100);
    } else {
      const designCurve = { below: stackMatrices(designBelow, wl), media, mode, n: nominal.n, k: nominal.k, wavelengthNm: wl };
      dCut = levelCutThickness(designCurve, truthCurve, dDesign).thicknessNm;
    }
    dCut *= 1 + (o.overshoot[layerNo] ?? 0);
    const rate = (o.rateNmPerS[material] ?? o.defaultRateNmPerS) * (1 + o.rateScatter * rngLayer.gauss());
    const latencyS = dl.monitor.cut === 'level' ? rngTiming.between(...o.levelLatencyS) : 0;
    const closeS = rngTiming.between(...o.shutterCloseS);
    const wander = o.rateWander;
    const rho = wander ? Math.exp(-dt / wander.correlationS) : 0;
    let w = wander ? wander.fraction * rngWander.gauss() : 0;

    // growing film: forward G = S_newest ⋯ S_1 and reverse Gr = S_1 ⋯ S_newest
    const G = identity(), Gr = identity();
    const S = new Float64Array(8), tmp = new Float64Array(8), F = new Float64Array(8), R = new Float64Array(8);
    const slabs: Sublayer[] = [];
    let slabD = 0, slabND = 0, d = 0, nd = 0, tau = 0, loggedEnd = -1, cutAt = -1, afterCut = 0;
    const indexAt = (x: number) => base + grade * (Math.min(x, 1.05) - 0.5);
    const grow = (dd: number) => {
      if (dd <= 0) return;
      const n = indexAt((d + dd / 2) / dCut);
      if (channels) {
        for (const c of channels) {
          layerMatrix(n + c.dn, c.k, dd, c.wavelengthNm, S);
          c.G.set(mul(S, c.G, tmp));
          c.Gr.set(mul(c.Gr, S, tmp));
        }
      } else {
        layerMatrix(n, nominal.k, dd, wl, S);
        G.set(mul(S, G, tmp));
        Gr.set(mul(Gr, S, tmp));
      }
      d += dd;
      nd += n * dd;
      slabD += dd;
      slabND += n * dd;
      if (slabD >= SLAB_NM) flushSlab();
    };
    const flushSlab = () => {
      if (slabD <= 0) return;
      slabs.push({ material, dn: slabND / slabD - nominal.n, thicknessNm: slabD });
      slabD = 0;
      slabND = 0;
    };
    const now = () => {
      if (channels) {
        // the detector reads the slit-weighted mean over the band (lamp and detector flat across it)
        let s = 0;
        for (const c of channels) {
          mul(c.G, c.below.forward, F);
          mul(c.below.reverse, c.Gr, R);
          const r = response(F, R, c.media);
          s += c.weight * (mode === 'R' ? r.R : r.T);
        }
        return s;
      }
      mul(G, below.forward, F);
      mul(below.reverse, Gr, R);
      const r = response(F, R, media);
      return mode === 'R' ? r.R : r.T;
    };
    const crystal = (x: number) => (o.tooling ? x / (o.tooling[material] ?? 1) : 0);
    const nominalS = dDesign / rate;
    const spikes = o.rateSpikes.filter((q) => q.layer === layerNo);
    const maxSamples = Math.ceil((5 * dDesign) / rate / dt) + 100;
    const firstLogged = out.length;
    for (let i = 0; i < maxSamples; i++) {
      push(now(), layerNo, chip, crystal(d));
      if (cutAt < 0 && d >= dCut) cutAt = tau;
      if (cutAt >= 0 && tau >= cutAt + latencyS - 1e-9) {
        loggedEnd = d;
        break;
      }
      const mid = tau + dt / 2;
      const spike = spikes.reduce((f, q) => (mid >= q.atFraction * nominalS && mid < q.atFraction * nominalS + q.durationS ? f * q.factor : f), 1);
      const r = rate * (o.rampS > 0 ? 1 - Math.exp(-mid / o.rampS) : 1) * (1 + w) * (1 + (o.rateDriftFraction * mid) / nominalS) * spike;
      grow(r * dt);
      tau += dt;
      if (wander) w = rho * w + wander.fraction * Math.sqrt(1 - rho * rho) * rngWander.gauss();
    }
    if (loggedEnd < 0) loggedEnd = d;
    const endS = out.timeAt(out.length - 1);
    // the shutter closes over closeS while the log already says idle
    const rEnd = rate * (1 + w) * (1 + (o.rateDriftFraction * tau) / nominalS);
    const closeCount = Math.ceil(closeS / dt);
    for (let k = 1; k <= closeCount; k++) {
      const s0 = (k - 1) * dt, s1 = Math.min(k * dt, closeS);
      // ∫ r(1 − s/closeS) ds over [s0, s1]
      const dd = rEnd * (s1 - s0 - (s1 * s1 - s0 * s0) / (2 * closeS));
      grow(dd);
      afterCut += dd;
      push(now(), 0, chip, 0);
    }
    flushSlab();
    stacks.add(chip, slabs);
    const list = designOnChip.get(chip) ?? [];
    list.push({ material, thicknessNm: dDesign });
    designOnChip.set(chip, list);
    const mean = nd / d;
    layers.push({
      layer: layerNo, material, chip, wavelengthNm: wl, mode, thicknessNm: d, designThicknessNm: dDesign, index: mean, nominalIndex: nominal.n,
      cutErrorQwotPct: ((mean * d - nominal.n * dDesign) / (wl / 4)) * 100, qwotAtMonitor: (4 * nominal.n * dDesign) / wl,
      rateNmPerS: loggedEnd / Math.max(tau, dt), startTimeS: out.timeAt(firstLogged), endTimeS: endS, afterCutNm: afterCut, shutterCloseS: closeS,
      indexStart: indexAt(0), indexEnd: indexAt(d / dCut),
    });
  }
  if (prev) {
    const level = stacks.bandLevel(prev.chip, prev.band, prev.mode);
    hold(o.settleS, () => level, prev.chip);
  }
  return {
    meta: { ...o.meta }, columns: { layer: o.columns.layer, chip: o.columns.chip, crystal: o.tooling !== undefined, reference: o.reference !== undefined && o.columns.reference },
    ...out.take(), sampleIntervalS: dt,
    truth: { layers, chips },
  };
}
