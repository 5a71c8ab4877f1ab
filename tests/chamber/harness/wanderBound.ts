// The bound on a layer's end thickness when its rate wanders: the wander is a random nuisance with
// a Gaussian prior, so the bound is the hybrid (Bayesian) Cramér–Rao bound on the mean-square error,
// J = [[JθᵀΣ⁻¹Jθ, JθᵀΣ⁻¹Ju], [JuᵀΣ⁻¹Jθ, JuᵀΣ⁻¹Ju + P⁻¹]], MSE(ψ̂) ≥ gᵀJ⁻¹g (H. L. Van Trees,
// Detection, Estimation, and Modulation Theory, Part I, 1968, §2.4; from memory). The simulator's
// Ornstein–Uhlenbeck wander is taken as constant over blocks of 1 s (an AR(1) across blocks):
// its integral, which is what moves the thickness, differs little at a 15 s correlation.
import { type ChamberDesign } from '../design';
import { type ChamberOptions, type ChamberRun, type LayerTruth } from '../options';
import { invert, quadratic, whiten } from './cramerRao';
import { detectorNoise, jacobianColumns, layerSignalModel } from './layerBound';

const BLOCK_S = 1;

/** σ of the end thickness (nm) from the layer's own samples, (n, r, a, G) free, the wander as the simulator draws it. */
export function wanderBoundNm(design: ChamberDesign, options: ChamberOptions, run: ChamberRun, truth: LayerTruth, gainPriorFraction = 0.005, blockS = BLOCK_S): number {
  const wander = options.rateWander;
  if (!wander) throw new RangeError('wanderBoundNm: the scenario has no rate wander');
  const model = layerSignalModel(design, options, run, truth);
  const dt = run.sampleIntervalS, n = model.samples, rate = model.theta[1];
  const per = Math.max(1, Math.round(blockS / dt)), blocks = Math.ceil(n / per);
  const jTheta = jacobianColumns(model, [0, 1, 2, 3]);
  // d_i = Σ_{j<i} r(1 + w_j)Δt (the simulator's growth), so ∂s_i/∂u_k = s'(d_i)·r·Δt·#{j < i in block k}
  // and s'(d_i) = (∂s_i/∂r)/τ_i
  const jU = Array.from({ length: blocks }, (_, k) => {
    const col = new Float64Array(n);
    for (let i = 1; i < n; i++) {
      const count = Math.min(Math.max(i - k * per, 0), per);
      if (count > 0) col[i] = (jTheta[1][i] / (i * dt)) * rate * dt * count;
    }
    return col;
  });
  const w = whiten([...jTheta, ...jU], detectorNoise(options));
  const m = w.length;
  const info = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let a = 0; a < m; a++) {
    for (let b = a; b < m; b++) {
      let s = 0;
      const x = w[a], y = w[b];
      for (let i = 0; i < n; i++) s += x[i] * y[i];
      info[a][b] = info[b][a] = s;
    }
  }
  info[3][3] += 1 / (gainPriorFraction * model.theta[3]) ** 2;
  // the stationary AR(1) prior's precision: tridiagonal (1, 1+ρ², …, 1+ρ², 1)/σ_e², off-diagonal −ρ/σ_e²
  const rho = Math.exp(-(per * dt) / wander.correlationS), e2 = wander.fraction ** 2 * (1 - rho * rho);
  for (let k = 0; k < blocks; k++) {
    info[4 + k][4 + k] += (k === 0 || k === blocks - 1 ? 1 : 1 + rho * rho) / e2;
    if (k > 0) info[4 + k][3 + k] = info[3 + k][4 + k] = info[4 + k][3 + k] - rho / e2;
  }
  const tau = model.tauEndS;
  const g = [0, tau, 0.5 * tau * tau, 0, ...Array.from({ length: blocks }, (_, k) => rate * dt * Math.min(Math.max(n - 1 - k * per, 0), per))];
  return Math.sqrt(quadratic(invert(info), g));
}
