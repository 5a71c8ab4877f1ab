import { describe, expect, it } from 'vitest';
import { readTraceText } from '@/analysis/trace';
import { chamberCsv, simulateChamberRun, type ChamberDesign } from '..';
import { stackMatrices, response } from '../thinFilm';
import { dispersion } from '../design';

const SiO2 = { model: 'sellmeier' as const, B: [0.6961663, 0.4079426, 0.8974794], C: [0.0684043, 0.1162414, 9.896161] };
const TiO2 = { model: 'cauchy' as const, A: 2.2, B: 0.03, C: 0.004, k: 0 };
const tp = (chip: number) => ({ wavelengthNm: 600, mode: 'T' as const, chip, cut: 'turning-point' as const });
const design: ChamberDesign = {
  referenceWavelengthNm: 600, substrate: SiO2, substrateBackside: true, materials: { H: TiO2, L: SiO2 },
  layers: [{ material: 'H', qwot: 1, monitor: tp(1) }, { material: 'L', qwot: 1, monitor: tp(1) }, { material: 'H', qwot: 1, monitor: tp(2) }],
};
// the old chip stays in the beam for 2 s after the last layer on it, so every cut is followed by its own level
const quiet = { whiteNoise: 0, rateScatter: 0, chipChange: { oldLevelS: [2, 2] as [number, number], darkS: [1, 1] as [number, number] } };

/** Independent of the simulator's bookkeeping: the truth stack's response from the truth file. */
function truthLevel(run: ReturnType<typeof simulateChamberRun>, upTo: number, chip: number): number {
  const layers = run.truth.layers.filter((l) => l.chip === chip && l.layer <= upTo).map((l) => ({ n: l.index, k: 0, thicknessNm: l.thicknessNm }));
  const m = stackMatrices(layers, 600);
  return response(m.forward, m.reverse, { ambient: 1, substrate: dispersion(SiO2, 600).n, backside: true }).T;
}

const lag1 = (v: number[]) => {
  const mean = v.reduce((a, b) => a + b, 0) / v.length;
  let num = 0, den = 0;
  for (let i = 0; i < v.length; i++) {
    den += (v[i] - mean) ** 2;
    if (i > 0) num += (v[i] - mean) * (v[i - 1] - mean);
  }
  return { rho: num / den, sd: Math.sqrt(den / v.length) };
};

describe('simulateChamberRun', () => {
  it('is deterministic for a seed; switching one effect off leaves the other draws as they were', () => {
    const a = simulateChamberRun(design, { seed: 4, spikes: { perMinute: 3, amplitude: [0.01, 0.02], maxSamples: 2 } });
    expect(chamberCsv(a)).toBe(chamberCsv(simulateChamberRun(design, { seed: 4, spikes: { perMinute: 3, amplitude: [0.01, 0.02], maxSamples: 2 } })));
    expect(chamberCsv(simulateChamberRun(design, { seed: 5 }))).not.toBe(chamberCsv(simulateChamberRun(design, { seed: 4 })));
    const b = simulateChamberRun(design, { seed: 4 });
    expect(b.truth.layers.map((l) => l.thicknessNm)).toEqual(a.truth.layers.map((l) => l.thicknessNm));
  });

  it('cuts on the true turning point: the level after each cut is the truth stack, an extremum', () => {
    const run = simulateChamberRun(design, { ...quiet, seed: 2, indexOffset: { H: 0.02 } });
    for (const t of run.truth.layers) {
      const end = run.layer.lastIndexOf(t.layer);
      expect(run.signal[end + 2]).toBeCloseTo(truthLevel(run, t.layer, t.chip), 10);
      // a quarter-wave on its true index: optical thickness λ/4 within the sampling step
      expect((4 * t.index * t.thicknessNm) / 600).toBeCloseTo(1, 2);
      expect(t.cutErrorQwotPct).toBeCloseTo(((t.index * t.thicknessNm - t.nominalIndex * t.designThicknessNm) / 150) * 100, 10);
    }
    expect(run.truth.layers[0].index).toBeCloseTo(dispersion(TiO2, 600).n + 0.02, 12);
  });

  it('keeps growing after the logged cut while the shutter closes (rate falling linearly: r·t/2)', () => {
    const run = simulateChamberRun(design, { ...quiet, seed: 3, shutterCloseS: [0.8, 0.8] });
    for (const t of run.truth.layers) {
      expect(t.afterCutNm).toBeCloseTo((t.rateNmPerS * 0.8) / 2, 2);
      const end = run.layer.lastIndexOf(t.layer);
      expect(run.layer[end + 1]).toBe(0);
      expect(run.signal[end + 9]).toBeCloseTo(truthLevel(run, t.layer, t.chip), 10);
      expect(Math.abs(run.signal[end + 9] - run.signal[end])).toBeGreaterThan(1e-6);
    }
  });

  it('a chip change shows the old chip, a dark transient, then the bare new chip, all logged on the new chip', () => {
    const run = simulateChamberRun(design, { ...quiet, seed: 6, chipChange: { oldLevelS: [3, 3], darkS: [2, 2] }, bareChipS: 10 });
    const end2 = run.layer.lastIndexOf(2);
    const old = truthLevel(run, 2, 1);
    expect(run.chip[end2 + 1]).toBe(2);
    expect(run.signal[end2 + 5]).toBeCloseTo(old, 10);
    expect(Math.min(...run.signal.subarray(end2 + 31, end2 + 51))).toBeCloseTo(0, 10);
    const bare = truthLevel(run, 0, 2);
    expect(run.signal[run.layer.indexOf(3) - 1]).toBeCloseTo(bare, 10);
    expect(run.truth.chips.map((c) => c.chip)).toEqual([1, 2]);
  });

  it('adds stray light, dark samples, lamp drift, correlated and white noise of the requested size', () => {
    const run = simulateChamberRun(design, { seed: 7, gain: 2, darkOffset: 0.01, strayFraction: 0.005, darkS: 30, bareChipS: 600, lampDriftPerHour: -0.02, whiteNoise: 0, correlatedNoise: { fraction: 0.0008, correlationS: 1 } });
    expect(run.signal[10]).toBeCloseTo(0.01, 10); // lamp off: dark offset only
    const bare = Array.from(run.signal.subarray(400, 6300), (v, i) => v - (0.01 + 2 * (1 - (0.02 * (40 + i * 0.1)) / 3600) * (0.005 + run.fraction[400 + i])));
    const { rho, sd } = lag1(bare);
    expect(rho).toBeGreaterThan(0.85); // e^(−0.1 s / 1 s) = 0.905
    expect(rho).toBeLessThan(0.95);
    expect(sd / (2 * 0.0008)).toBeGreaterThan(0.6);
    expect(sd / (2 * 0.0008)).toBeLessThan(1.4);
    const c1 = run.truth.chips[0];
    expect(c1.offset).toBeCloseTo(0.01 + c1.gain * 0.005, 12);
    expect(c1.gain).toBeLessThan(2);
  });

  it('adds a lamp ripple, sampled at each reading\'s time, and a detector that reads low toward full scale', () => {
    // no noise: each reading is the lamp times the truth's fraction, so the ripple and the
    // compression can be read off sample by sample against the formulas they are documented by
    const base = { seed: 9, whiteNoise: 0, gain: 1.5 };
    const plain = simulateChamberRun(design, base);
    const rippled = simulateChamberRun(design, { ...base, lampRipple: { fraction: 0.002, frequencyHz: 100.05 } });
    const squeezed = simulateChamberRun(design, { ...base, nonlinearity: 0.01 });
    expect(Array.from(rippled.fraction)).toEqual(Array.from(plain.fraction));
    let worstRipple = 0, worstSqueeze = 0, beatSeen = 0;
    for (let i = 0; i < plain.signal.length; i += 7) {
      const tS = i * plain.sampleIntervalS;
      if (plain.signal[i] === 0) continue;
      // 100.05 Hz read every 0.1 s is a 0.05 Hz beat: sin(2π·100.05·t) = sin(2π·0.05·t) at t = k·0.1
      const expected = 1 + 0.002 * Math.sin(2 * Math.PI * 0.05 * tS);
      worstRipple = Math.max(worstRipple, Math.abs(rippled.signal[i] / plain.signal[i] - expected));
      beatSeen = Math.max(beatSeen, Math.abs(rippled.signal[i] / plain.signal[i] - 1));
      // v·(1 − β·v/gain)
      const v = plain.signal[i];
      worstSqueeze = Math.max(worstSqueeze, Math.abs(squeezed.signal[i] - v * (1 - (0.01 * v) / 1.5)));
    }
    expect(worstRipple).toBeLessThan(1e-9);
    expect(beatSeen).toBeGreaterThan(0.0019);
    expect(worstSqueeze).toBeLessThan(1e-12);
  });

  it('adds spikes, time-stamp jitter and a rate ramp as the shutter opens', () => {
    const base = simulateChamberRun(design, { seed: 8, whiteNoise: 0 });
    const run = simulateChamberRun(design, { seed: 8, whiteNoise: 0, spikes: { perMinute: 6, amplitude: [0.01, 0.02], maxSamples: 2 }, jitterFraction: 0.3 });
    let spiky = 0;
    for (let i = 0; i < run.signal.length; i++) if (Math.abs(run.signal[i] - base.signal[i]) > 0.009) spiky++;
    const minutes = (run.timeS.length * 0.1) / 60;
    expect(spiky / minutes).toBeGreaterThan(3);
    expect(spiky / minutes).toBeLessThan(20);
    let jittered = 0;
    for (let i = 1; i < run.timeS.length; i++) {
      expect(run.timeS[i]).toBeGreaterThan(run.timeS[i - 1]);
      expect(Math.abs(run.timeS[i] - i * 0.1)).toBeLessThanOrEqual(0.03 + 1e-9);
      if (Math.abs(run.timeS[i] - i * 0.1) > 0.005) jittered++;
    }
    expect(jittered).toBeGreaterThan(run.timeS.length / 2);
    const ramped = simulateChamberRun(design, { ...quiet, seed: 8, rampS: 3 });
    const plain = simulateChamberRun(design, { ...quiet, seed: 8 });
    const durationOf = (r: typeof plain) => r.truth.layers[0].endTimeS - r.truth.layers[0].startTimeS;
    expect(durationOf(ramped) - durationOf(plain)).toBeGreaterThan(2.5); // the ramp loses about τ of growth
  });

  it('grades the index within a layer and drifts it across the run; the truth index is the thickness-weighted mean', () => {
    const run = simulateChamberRun(design, { ...quiet, seed: 9, indexWithinLayer: { H: 0.01 }, indexDriftPerHour: { H: -0.036 } });
    const [l1, , l3] = run.truth.layers;
    expect(l1.indexEnd - l1.indexStart).toBeCloseTo(0.01, 2);
    expect(l1.index).toBeCloseTo((l1.indexStart + l1.indexEnd) / 2, 3);
    expect(l3.index - l1.index).toBeCloseTo((-0.036 * (l3.startTimeS - l1.startTimeS)) / 3600, 3);
  });

  it('cuts a level layer where the true curve reaches the design trigger level', () => {
    const lv: ChamberDesign = { ...design, layers: [{ material: 'H', thicknessNm: 40, monitor: { ...tp(1), cut: 'level' } }] };
    const nominal = simulateChamberRun(lv, { ...quiet, seed: 1 });
    const off = simulateChamberRun(lv, { ...quiet, seed: 1, indexOffset: { H: 0.05 } });
    expect(nominal.truth.layers[0].thicknessNm).toBeCloseTo(40, 0);
    // a higher index reaches the same level with less physical thickness
    expect(off.truth.layers[0].thicknessNm).toBeLessThan(39.5);
    const endOf = (r: typeof off) => r.fraction[r.layer.lastIndexOf(1)];
    expect(endOf(off)).toBeCloseTo(endOf(nominal), 3);
  });

  it('writes trace CSV the project reads, with or without layer and chip columns, with crystal_nm', async () => {
    const run = simulateChamberRun(design, { seed: 10, meta: { chamber: 'Bay 9' }, tooling: { H: 1.1, L: 0.9 } });
    const trace = await readTraceText(chamberCsv(run));
    expect(trace.columns).toEqual(['time_s', 'signal', 'layer', 'chip', 'crystal_nm']);
    expect(trace.meta.chamber).toBe('Bay 9');
    expect(trace.rowCount).toBe(run.timeS.length);
    const end = run.layer.lastIndexOf(1);
    expect(trace.crystalNm![end]).toBeCloseTo((run.truth.layers[0].thicknessNm - run.truth.layers[0].afterCutNm) / 1.1, 1);
    const bare = await readTraceText(chamberCsv(simulateChamberRun(design, { seed: 10, columns: { layer: false, chip: false } })));
    expect(bare.columns).toEqual(['time_s', 'signal']);
  });
});
