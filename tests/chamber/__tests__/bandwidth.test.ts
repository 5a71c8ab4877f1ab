import { describe, expect, it } from 'vitest';
import { simulateChamberRun, type ChamberDesign } from '..';
import { dispersion } from '../design';
import { SILICA, SIO2_FILM, TIO2_FILM } from '../materials';
import { stackRT, type FilmLayer } from '../thinFilm';

// Option bandwidthNm: each sample is R or T averaged over a triangular slit function of that FWHM
// (triangular in wavelength). Checked here against closed forms and a fine rule that share
// nothing with the simulator's band (band.ts) but the thin-film optics (thinFilm.test.ts).

const sinc2 = (x: number) => (x === 0 ? 1 : (Math.sin(Math.PI * x) / (Math.PI * x)) ** 2);

/**
 * T of one non-absorbing layer (n1, thickness d) on a substrate ns with no back face, in air,
 * averaged over a slit function triangular in wavenumber of FWHM Δσ centred on 1/λ0.
 * Airy: T = ns·t01²t12²/|1 + ρ e^(−iφ)|², ρ = r01·r12, φ = 2π·OPD·σ, OPD = 2·n1·d (Born & Wolf,
 * Principles of Optics, §7.6 on the plane-parallel plate and §1.6 on a single film; Macleod,
 * Thin-Film Optical Filters, ch. 2; from memory of the section numbers). Its Fourier series in φ
 * is exact (the Poisson kernel): 1/(1 + 2ρ cos φ + ρ²) = (1 + 2 Σ_{m≥1} (−ρ)^m cos mφ)/(1 − ρ²),
 * and a triangle of FWHM Δσ in σ, the convolution of two equal boxcars, has the Fourier transform
 * sinc² (Hecht, Optics, ch. 11 on Fourier methods; Born & Wolf ch. 10 on partially coherent
 * light, the visibility of fringes in a finite band; from memory), so the m-th harmonic's
 * contrast is multiplied by sinc²(m·OPD·Δσ), sinc x = sin(πx)/(πx).
 */
function airyBandT(dNm: number, n1: number, ns: number, lambda0: number, dSigma: number): number {
  const r01 = (1 - n1) / (1 + n1), r12 = (n1 - ns) / (n1 + ns);
  const t01 = 2 / (1 + n1), t12 = (2 * n1) / (n1 + ns);
  const rho = r01 * r12;
  const opd = 2 * n1 * dNm;
  let s = 1;
  for (let m = 1; m <= 40; m++) s += 2 * (-rho) ** m * Math.cos((2 * Math.PI * m * opd) / lambda0) * sinc2(m * opd * dSigma);
  return (ns * t01 * t01 * t12 * t12 * s) / (1 - rho * rho);
}

const single = (n1: number, ns: number): ChamberDesign => ({
  referenceWavelengthNm: 600, substrate: { model: 'constant', n: ns }, substrateBackside: false, materials: { H: { model: 'constant', n: n1 } },
  layers: [{ material: 'H', thicknessNm: 3000, monitor: { wavelengthNm: 600, mode: 'T', chip: 1, cut: 'turning-point' } }],
});
// no noise, no rate scatter: the k-th sample of a layer stands at k·rate·dt
const quiet = { whiteNoise: 0, rateScatter: 0, defaultRateNmPerS: 3, bareChipS: 1 };

/** Each sample of a layer with the thickness it was taken at. */
function layerSamples(run: ReturnType<typeof simulateChamberRun>, layer: number, rate: number): { d: number; y: number }[] {
  const out: { d: number; y: number }[] = [];
  const first = run.layer.indexOf(layer);
  for (let i = first; i < run.layer.length && run.layer[i] === layer; i++) out.push({ d: (i - first) * rate * run.sampleIntervalS, y: run.fraction[i] });
  return out;
}

describe('chamber simulator: the monitor\'s spectral bandwidth (option bandwidthNm)', () => {
  it('a thick single layer: the m-th fringe harmonic loses contrast by sinc²(m·OPD·Δσ) (Airy series, triangle in wavenumber)', () => {
    const n1 = 2.3, ns = 1.52, lambda0 = 600, fwhm = 5;
    // without the option: the Airy formula itself, to rounding
    const mono = layerSamples(simulateChamberRun(single(n1, ns), quiet), 1, 3);
    for (const s of mono) expect(Math.abs(s.y - airyBandT(s.d, n1, ns, lambda0, 0))).toBeLessThan(1e-10);

    const band = layerSamples(simulateChamberRun(single(n1, ns), { ...quiet, bandwidthNm: fwhm }), 1, 3);
    const dMax = band[band.length - 1].d;
    expect(dMax).toBeGreaterThan(2900); // 13.6 µm of optical path: sinc²(OPD·Δσ) = 0.88 at the end
    // The simulator's slit is triangular in wavelength; mapped to σ = 1/λ it is the triangle in σ
    // of FWHM Δσ = w/λ0² (σ' = 1/λ0 − (λ − λ0)/λ0²) moved by |σ − σ'| = (λ − λ0)²/(λ·λ0²), whose
    // mean is at most (w²/6)/((λ0 − w)·λ0²) (the triangle's variance w²/6). With |dT/dσ| at most
    // ns·t01²t12²·2|ρ|·2π·OPD/(1 − |ρ|)⁴, the two band means differ by at most their product.
    const dSigma = fwhm / lambda0 ** 2;
    const r01 = (1 - n1) / (1 + n1), r12 = (n1 - ns) / (n1 + ns), rho = Math.abs(r01 * r12);
    const lipschitz = (ns * (2 / (1 + n1)) ** 2 * ((2 * n1) / (n1 + ns)) ** 2 * 2 * rho * 2 * Math.PI * 2 * n1 * dMax) / (1 - rho) ** 4;
    const shift = fwhm ** 2 / 6 / ((lambda0 - fwhm) * lambda0 ** 2);
    const bound = lipschitz * shift + 1e-6; // + the quadrature's share (below: 3e-12 on 40 layers)
    expect(bound).toBeLessThan(4e-4);
    let worst = 0, worstMono = 0;
    for (const s of band) {
      worst = Math.max(worst, Math.abs(s.y - airyBandT(s.d, n1, ns, lambda0, dSigma)));
      worstMono = Math.max(worstMono, Math.abs(s.y - airyBandT(s.d, n1, ns, lambda0, 0)));
    }
    expect(worst).toBeLessThan(bound);
    // the test has power: the band's loss of contrast is far beyond that bound
    expect(worstMono).toBeGreaterThan(20 * bound);
    // and a slit function of another shape or width would miss: a boxcar of the same FWHM
    // (contrast sinc, not sinc²) or a triangle of half the FWHM
    const boxcar = (d: number) => {
      const r = r01 * r12, opd = 2 * n1 * d;
      let s = 1;
      for (let m = 1; m <= 40; m++) s += 2 * (-r) ** m * Math.cos((2 * Math.PI * m * opd) / lambda0) * Math.sqrt(sinc2(m * opd * dSigma));
      return (ns * (2 / (1 + n1)) ** 2 * ((2 * n1) / (n1 + ns)) ** 2 * s) / (1 - r * r);
    };
    expect(Math.max(...band.map((s) => Math.abs(s.y - boxcar(s.d))))).toBeGreaterThan(10 * bound);
    expect(Math.max(...band.map((s) => Math.abs(s.y - airyBandT(s.d, n1, ns, lambda0, dSigma / 2))))).toBeGreaterThan(10 * bound);
  });

  it('a 40-layer quarter-wave stack at 5 nm FWHM: every sample within 1e-9 of the slit-weighted mean by Simpson\'s rule on 400 intervals', () => {
    const lambda0 = 600, fwhm = 5, rate = 2;
    const design: ChamberDesign = {
      referenceWavelengthNm: 600, substrate: SILICA, substrateBackside: true, materials: { H: TIO2_FILM, L: SIO2_FILM },
      layers: Array.from({ length: 40 }, (_, i) => ({ material: i % 2 ? 'L' : 'H', qwot: 1, monitor: { wavelengthNm: 600, mode: 'T' as const, chip: 1, cut: 'turning-point' as const } })),
    };
    const run = simulateChamberRun(design, { ...quiet, defaultRateNmPerS: rate, bandwidthNm: fwhm });
    // Simpson on each half of the triangle (its kink at the centre a node), 200 intervals a half
    const half = 200, h = fwhm / half;
    const nodes: { wl: number; w: number }[] = [];
    for (let j = -half; j <= half; j++) {
      const simpson = Math.abs(j) === half || j === 0 ? 1 : Math.abs(j) % 2 ? 4 : 2;
      nodes.push({ wl: lambda0 + j * h, w: ((simpson * h) / 3) * (j === 0 ? 2 : 1) * ((1 - Math.abs(j) / half) / fwhm) });
    }
    expect(nodes.reduce((a, b) => a + b.w, 0)).toBeCloseTo(1, 12);
    let worst = 0, worstMono = 0, checked = 0;
    for (const t of run.truth.layers) {
      const below = run.truth.layers.filter((l) => l.layer < t.layer);
      const samples = layerSamples(run, t.layer, rate);
      for (let k = 0; k < samples.length; k += 20) {
        const at = (wl: number) => {
          const layers: FilmLayer[] = [...below, { ...t, thicknessNm: samples[k].d }].map((l) => ({
            n: dispersion(design.materials[l.material], wl).n + (l.index - l.nominalIndex), k: 0, thicknessNm: l.thicknessNm,
          }));
          return stackRT(layers, wl, { ambient: 1, substrate: dispersion(SILICA, wl).n, backside: true }).T;
        };
        const ref = nodes.reduce((acc, { wl, w }) => acc + w * at(wl), 0);
        worst = Math.max(worst, Math.abs(samples[k].y - ref));
        worstMono = Math.max(worstMono, Math.abs(at(lambda0) - ref));
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(400);
    // measured: 3.2e-12 with band.ts's 3 nodes a half; 1.2e-8 with 2, 4.5e-5 with 1
    expect(worst).toBeLessThan(1e-9);
    // the band's own effect here, 8.9e-5 of full scale: small, since a quarter-wave stack's
    // response is stationary in wavelength at its centre, so only the band's second moment acts
    expect(worstMono).toBeGreaterThan(5e-5);
  });
});
