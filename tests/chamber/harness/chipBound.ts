// The Cramér–Rao bound of every layer on a chip from all of the chip's samples together (the
// bare chip, every layer, the idle stretches between them): what the whole record allows, where
// harness/layerBound.ts gives what a layer's own samples allow. The simulator's optics only.
import { type ChamberDesign, dispersion } from '../design';
import { type ChamberOptions, type ChamberRun, type LayerTruth } from '../options';
import { layerMatrix, mul, response, stackMatrices, type Mat } from '../thinFilm';
import { invert, quadratic, whiten } from './cramerRao';
import { detectorNoise } from './layerBound';

export interface ChipBoundOptions {
  /**
   * The growth after each cut: 'known' (at the truth), or 'free' for every layer with another
   * after it on the chip (told by how the next layer starts; the chip's last is held known, as
   * nothing after it tells it to first order at a turning point). @default 'known'
   */
  growth?: 'known' | 'free';
  /**
   * With the scenario's rateWander: each layer's wander as a random nuisance under its prior,
   * constant over blocks of this many seconds (the hybrid bound of wanderBound.ts, over the chip;
   * the simulator draws each layer's wander afresh). @default none (no wander)
   */
  wanderBlockS?: number;
  /**
   * The index of layers thinner than 0.5 QWOT: 'free' (own data only), or a Gaussian prior of this
   * σ about the truth (0: known), as an analysis that holds a thin layer's index from the run's
   * other layers of its material has at best. @default 'free'
   */
  thinIndex?: 'free' | number;
  /** One index per material on the chip (the simulator's truth without index scatter or drift). @default false */
  sharedIndex?: boolean;
  /** Free rate drift a in d = r·τ + a·τ²/2 per layer (false: known, as where the simulator has none). @default true */
  rateDrift?: boolean;
  /**
   * The lamp's drift within the chip as a parameter: the gain G·(1 + γ·(t − t₀)), t₀ the chip's
   * first layer start, γ under a Gaussian prior of this σ (fraction per hour) about the truth, as
   * an analysis without a reference column has it at best (fit/gainDriftPrior.ts). @default none (γ known)
   */
  lampDriftSigmaPerHour?: number;
  /**
   * The rate's start-up as the shutter opens (the simulator's r·(1 − e^(−τ/ρ)), rampS) in the law:
   * 'known' (ρ at the truth) or 'free' (ρ one parameter for the chip: what the chip's record allows
   * where the start-up is not known beforehand). Not with wanderBlockS. @default none (the law without it)
   */
  ramp?: 'known' | 'free';
}

export interface ChipLayerBound {
  layer: number;
  /** σ_CRB of the deposited thickness (end of the logged layer + growth), nm; of n; of n·d, nm. */
  thicknessSigmaNm: number;
  indexSigma: number;
  opticalSigmaNm: number;
  cutSigmaQwotPct: number;
}

/**
 * Parameters per layer (n, r, a[, g]) and one gain for the chip (the simulator's gain, constant
 * without lamp drift); the chip's samples as one record of white + AR(1) noise.
 */
export function chipBound(design: ChamberDesign, options: ChamberOptions, run: ChamberRun, chip: number, o: ChipBoundOptions = {}): ChipLayerBound[] {
  const dt = run.sampleIntervalS;
  const layers: LayerTruth[] = run.truth.layers.filter((l) => l.chip === chip);
  if (!layers.length) return [];
  const wl = layers[0].wavelengthNm, mode = layers[0].mode;
  if (layers.some((l) => l.wavelengthNm !== wl || l.mode !== mode)) throw new RangeError('chipBound: one monitor wavelength and mode per chip');
  const idx: number[] = [];
  for (let i = 0; i < run.chip.length; i++) if (run.chip[i] === chip) idx.push(i);
  // which layer each sample belongs to (−1 idle) and, idle, how many layers lie below
  const first = new Map<number, number>();
  for (const i of idx) if (run.layer[i] > 0 && !first.has(run.layer[i])) first.set(run.layer[i], i);
  const pos = new Map(layers.map((l, k) => [l.layer, k]));
  const k = layers.map((l) => dispersion(design.materials[l.material], wl).k);
  const media = {
    ambient: design.ambient ? dispersion(design.ambient, wl).n : 1, substrate: dispersion(design.substrate, wl).n, backside: design.substrateBackside,
  };
  const tauEnd = layers.map((l) => (run.layer.filter((v) => v === l.layer).length - 1) * dt);
  // θ = [n, r, a, g] per layer, then G, the lamp's drift γ and the start-up's ρ (each free or held by the options)
  const per = 4, gIndex = per * layers.length;
  // with the ramp, d(τ) = r·(τ − ρ·(1 − e^(−τ/ρ))) + a·τ²/2 (+ the growth after the cut at the end)
  const ramp = o.ramp !== undefined;
  if (ramp && o.wanderBlockS !== undefined) throw new RangeError('chipBound: ramp with wanderBlockS');
  const rho0 = ramp ? Math.max(options.rampS ?? 0, 0.05) : 0;
  const lag = (tau: number, rho: number) => (rho > 0 ? rho * (1 - Math.exp(-tau / rho)) : 0);
  const theta = layers.flatMap((l, j) => [l.index, (l.thicknessNm - l.afterCutNm) / (tauEnd[j] - lag(tauEnd[j], rho0)), 0, l.afterCutNm]);
  const lampPerS = (options.lampDriftPerHour ?? 0) / 3600, t0 = layers[0].startTimeS;
  const lamp = o.lampDriftSigmaPerHour !== undefined;
  // with the lamp's drift a parameter the gain is G at t₀ and moves with it; without, one G for the chip
  theta.push(1 + lampPerS * t0);
  const lIndex = gIndex + 1;
  theta.push(lampPerS);
  const rIndex = lIndex + 1;
  theta.push(rho0);
  const steps = layers.flatMap((l, j) => [1e-4, (1e-4 * l.thicknessNm) / tauEnd[j], (1e-4 * l.thicknessNm) / tauEnd[j] ** 2, 1e-3]);
  steps.push(1e-4, 1e-4 / 3600, 1e-3);
  const fullScale = options.gain ?? 1;

  const signal = (t: readonly number[]): Float64Array => {
    const rho = t[rIndex];
    const dEnd = layers.map((_, j) => t[per * j + 1] * (tauEnd[j] - lag(tauEnd[j], rho)) + 0.5 * t[per * j + 2] * tauEnd[j] ** 2 + t[per * j + 3]);
    // completed stacks: stacks[j] holds layers 0..j−1
    const stacks = layers.map((_, j) => stackMatrices(layers.slice(0, j).map((l, q) => ({ n: t[per * q], k: k[q], thicknessNm: dEnd[q] })), wl));
    stacks.push(stackMatrices(layers.map((l, q) => ({ n: t[per * q], k: k[q], thicknessNm: dEnd[q] })), wl));
    const out = new Float64Array(idx.length);
    const lm = new Float64Array(8), f = new Float64Array(8), rv = new Float64Array(8);
    const level = (s: { forward: Mat; reverse: Mat }) => {
      const x = response(s.forward, s.reverse, media);
      return mode === 'R' ? x.R : x.T;
    };
    let done = 0;
    idx.forEach((i, s) => {
      const L = run.layer[i];
      let v: number;
      if (L > 0) {
        const j = pos.get(L)!;
        done = j + 1;
        const tau = (i - first.get(L)!) * dt;
        layerMatrix(t[per * j], k[j], t[per * j + 1] * (tau - lag(tau, rho)) + 0.5 * t[per * j + 2] * tau * tau, wl, lm);
        mul(lm, stacks[j].forward, f);
        mul(stacks[j].reverse, lm, rv);
        const x = response(f, rv, media);
        v = mode === 'R' ? x.R : x.T;
      } else v = level(stacks[done]);
      out[s] = fullScale * t[gIndex] * (lamp ? 1 + t[lIndex] * (run.timeS[i] - t0) : 1) * v;
    });
    return out;
  };

  const growth = o.growth ?? 'known';
  const free = [...layers.flatMap((_, j) => [per * j, per * j + 1, ...(o.rateDrift === false ? [] : [per * j + 2]), ...(growth === 'free' && j < layers.length - 1 ? [per * j + 3] : [])]), gIndex, ...(lamp ? [lIndex] : []), ...(o.ramp === 'free' ? [rIndex] : [])];
  const derivative = (p: number) => {
    const up = [...theta], down = [...theta];
    up[p] += steps[p];
    down[p] -= steps[p];
    const a = signal(up), b = signal(down);
    return a.map((v, i) => (v - b[i]) / (2 * steps[p]));
  };
  const thinPrior = o.thinIndex === undefined || o.thinIndex === 'free' ? null : o.thinIndex;
  const thin = (j: number) => layers[j].qwotAtMonitor < 0.5;
  // a thin layer's index held known leaves the parameters; a prior adds 1/σ² to its information
  if (thinPrior === 0) for (let j = layers.length - 1; j >= 0; j--) if (thin(j)) free.splice(free.indexOf(per * j), 1);
  const raw = free.map(derivative);
  // shared: each material's index one parameter, ∂s/∂n = Σ over its layers' ∂s/∂n_j (the first layer's slot holds it)
  const nSlot = layers.map((_, j) => free.indexOf(per * j));
  if (o.sharedIndex) {
    layers.forEach((l, j) => {
      const owner = layers.findIndex((m, q) => m.material === l.material && nSlot[q] >= 0 && free[nSlot[q]] === per * q);
      if (owner >= 0 && owner !== j && nSlot[j] >= 0) {
        const a = raw[nSlot[owner]], b = raw[nSlot[j]];
        for (let i = 0; i < a.length; i++) a[i] += b[i];
        nSlot[j] = nSlot[owner];
      }
    });
  }
  const dropped = new Set(layers.flatMap((_, j) => (nSlot[j] >= 0 && free[nSlot[j]] !== per * j ? [free.indexOf(per * j)] : [])));
  const keep = free.map((_, c) => !dropped.has(c));
  const columns = raw.filter((_, c) => keep[c]);
  const colOf = (c: number) => (c < 0 ? -1 : keep.slice(0, c).filter(Boolean).length);
  // The wander's columns from ∂s/∂r and ∂s/∂(end thickness) (= ∂s/∂g): in layer j at step m,
  // ∂s/∂u_k = (∂s/∂r)/τ_m · r·Δt·#{steps < m in block k}; after it, ∂s/∂g · r·Δt·#{steps in block k}.
  function wanderColumns(blockS: number) {
    const w = options.rateWander!;
    const B = Math.max(1, Math.round(blockS / dt)), rho = Math.exp(-(B * dt) / w.correlationS), e2 = w.fraction ** 2 * (1 - rho * rho);
    const out: Float64Array[] = [], firstNonZero: number[] = [], prior: [number, number, number][] = [], offsets: number[] = [];
    const count = (m: number, kb: number) => Math.min(Math.max(m - kb * B, 0), B);
    layers.forEach((l, j) => {
      const jr = raw[free.indexOf(per * j + 1)], jg = derivative(per * j + 3);
      const nj = Math.round(tauEnd[j] / dt) + 1, blocks = Math.ceil(nj / B), r = theta[per * j + 1];
      const f0 = first.get(l.layer)!, last = f0 + nj - 1;
      offsets.push(out.length);
      for (let kb = 0; kb < blocks; kb++) {
        const col = new Float64Array(idx.length);
        let nz = -1;
        idx.forEach((i, q) => {
          if (i >= f0 && i <= last) {
            const m = i - f0;
            if (m > 0 && count(m, kb) > 0) col[q] = (jr[q] / (m * dt)) * r * dt * count(m, kb);
          } else if (i > last) col[q] = jg[q] * r * dt * count(nj - 1, kb);
          if (nz < 0 && col[q] !== 0) nz = q;
        });
        const a = out.length;
        out.push(col);
        firstNonZero.push(nz < 0 ? idx.length : nz);
        prior.push([a, a, (kb === 0 || kb === blocks - 1 ? 1 : 1 + rho * rho) / e2]);
        if (kb > 0) prior.push([a, a - 1, -rho / e2], [a - 1, a, -rho / e2]);
      }
    });
    const endGradient = (j: number) => out.map((_, a) => {
      const start = offsets[j], end = j + 1 < offsets.length ? offsets[j + 1] : out.length;
      if (a < start || a >= end) return 0;
      return theta[per * j + 1] * dt * count(Math.round(tauEnd[j] / dt), a - start);
    });
    return { columns: out, firstNonZero: [...columns.map(() => 0), ...firstNonZero], prior, endGradient };
  }

  const wander = o.wanderBlockS !== undefined && options.rateWander ? wanderColumns(o.wanderBlockS) : null;
  const all = [...columns, ...(wander?.columns ?? [])];
  const info = gram(whiten(all, detectorNoise(options)), wander?.firstNonZero);
  if (wander) for (const [a, b, v] of wander.prior) info[columns.length + a][columns.length + b] += v;
  if (lamp) info[colOf(free.indexOf(lIndex))][colOf(free.indexOf(lIndex))] += 1 / (o.lampDriftSigmaPerHour! / 3600) ** 2;
  if (thinPrior !== null && thinPrior > 0) layers.forEach((_, j) => { if (thin(j) && nSlot[j] >= 0) info[colOf(nSlot[j])][colOf(nSlot[j])] += 1 / thinPrior ** 2; });
  const crb = invert(info);
  return layers.map((l, j) => {
    // ∂d_end/∂θ: the rate's lever is the time at full rate, τ − lag; ∂lag/∂ρ = 1 − e^(−τ/ρ)·(1 + τ/ρ)
    const tE = tauEnd[j], e = rho0 > 0 ? Math.exp(-tE / rho0) : 0;
    const dLag = rho0 > 0 ? 1 - e * (1 + tE / rho0) : 0;
    const gradTheta = free.filter((_, c) => keep[c]).map((p) => (p === per * j + 1 ? tE - lag(tE, rho0) : p === per * j + 2 ? 0.5 * tE ** 2 : p === per * j + 3 ? 1
      : p === rIndex ? -theta[per * j + 1] * dLag : 0));
    const gradD = [...gradTheta, ...(wander ? wander.endGradient(j) : [])];
    const nCol = colOf(nSlot[j]);
    const gradND = gradD.map((v, q) => (q === nCol ? l.thicknessNm : l.index * v));
    const opticalSigmaNm = Math.sqrt(quadratic(crb, gradND));
    return {
      layer: l.layer, thicknessSigmaNm: Math.sqrt(quadratic(crb, gradD)), indexSigma: nCol < 0 ? 0 : Math.sqrt(crb[nCol][nCol]),
      opticalSigmaNm, cutSigmaQwotPct: (opticalSigmaNm / (wl / 4)) * 100,
    };
  });
}

/** Wᵀ·W of whitened columns; a column zero before `firstNonZero[c]` stays so after whitening. */
function gram(w: readonly Float64Array[], firstNonZero?: readonly number[]): number[][] {
  const m = w.length, n = m ? w[0].length : 0;
  const info = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let a = 0; a < m; a++) {
    for (let b = a; b < m; b++) {
      const x = w[a], y = w[b];
      let s = 0;
      for (let i = Math.max(firstNonZero?.[a] ?? 0, firstNonZero?.[b] ?? 0); i < n; i++) s += x[i] * y[i];
      info[a][b] = info[b][a] = s;
    }
  }
  return info;
}
