import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cutPlan, monitorCurve, parseDesign, planLayer, PLAN_THRESHOLDS, type Design } from '..';

const load = (name: string) => parseDesign(JSON.parse(readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8')), name);

type L = { material: string; qwot?: number; thicknessNm?: number; cut?: 'level' | 'turning-point'; mode?: 'T' | 'R'; chip?: number };
function design(materials: Record<string, unknown>, layers: L[], substrateBackside = false, substrate: unknown = { model: 'constant', n: 1.52 }): Design {
  return parseDesign({
    format: 'fringelog.design/1',
    name: 't',
    referenceWavelengthNm: 600,
    substrate,
    substrateBackside,
    materials,
    layers: layers.map((l) => ({
      material: l.material,
      ...(l.qwot !== undefined ? { qwot: l.qwot } : { thicknessNm: l.thicknessNm }),
      monitor: { wavelengthNm: 600, mode: l.mode ?? 'R', chip: l.chip ?? 1, cut: l.cut ?? 'turning-point' },
    })),
  });
}

const rOfY = (y: number) => ((1 - y) / (1 + y)) ** 2;

describe('cutPlan on quarter-wave stacks (admittance recurrence Y → n²/Y; Macleod, Thin-Film Optical Filters, ch. 2–3)', () => {
  const d = load('hl7-reflector.json');
  const plan = cutPlan(d);
  // Chip 1 carries layers 1, 2, 3, 6, 7; chip 2 carries 4, 5; each starts on bare 1.52.
  const chipOf = [1, 1, 1, 2, 2, 1, 1];
  const nOf = [2.35, 1.46, 2.35, 1.46, 2.35, 1.46, 2.35];
  const y: Record<number, number> = { 1: 1.52, 2: 1.52 };

  it('each layer ends on exactly one turning point at its quarter-wave, with the recurrence value', () => {
    plan.forEach((p, i) => {
      const start = y[chipOf[i]];
      y[chipOf[i]] = nOf[i] ** 2 / start;
      expect(p.startSignal).toBeCloseTo(rOfY(start), 12);
      expect(p.cutSignal).toBeCloseTo(rOfY(y[chipOf[i]]), 12);
      expect(p.turningPoints).toBe(1);
      expect(p.turningPointList[0].thicknessNm).toBeCloseTo(p.thicknessNm, 6);
      expect(p.turningPointList[0].signal).toBeCloseTo(rOfY(y[chipOf[i]]), 10);
      expect(p.turningPointList[0].kind).toBe(nOf[i] === 2.35 ? 'max' : 'min');
      expect(p.warnings).toEqual([]);
      expect(p.slopePerNm).toBeCloseTo(0, 8);
    });
  });

  it('keeps the FORMATS.md plan keys', () => {
    expect(Object.keys(plan[0])).toEqual(expect.arrayContaining(['layer', 'wavelengthNm', 'mode', 'chip', 'turningPoints', 'startSignal', 'cutSignal', 'swingPct']));
    expect(plan.map((p) => p.chip)).toEqual(chipOf);
  });
});

describe('turning points inside thick layers', () => {
  it('3 QW of n = 2.35 on 1.52: max at 1 and 3 QW, a min at 2 QW equal to bare glass (half-wave absent; Macleod ch. 3)', () => {
    const p = planLayer(design({ H: { model: 'constant', n: 2.35 } }, [{ material: 'H', qwot: 3 }]), 1);
    const qw = 600 / (4 * 2.35);
    expect(p.turningPoints).toBe(3);
    expect(p.turningPointList.map((t) => t.kind)).toEqual(['max', 'min', 'max']);
    p.turningPointList.forEach((t, i) => expect(t.thicknessNm).toBeCloseTo((i + 1) * qw, 6));
    expect(p.turningPointList[1].signal).toBeCloseTo(((1 - 1.52) / (1 + 1.52)) ** 2, 12);
    expect(p.turningPointList[0].signal).toBeCloseTo(rOfY(2.35 ** 2 / 1.52), 10);
  });

  it('an absorbing layer on an arbitrary stack: refined turning points match a 10⁶-point brute-force scan', () => {
    const d = design(
      { H: { model: 'constant', n: 2.2, k: 0.02 }, L: { model: 'constant', n: 1.45 } },
      [{ material: 'L', thicknessNm: 37, cut: 'level' }, { material: 'H', thicknessNm: 230, cut: 'level', mode: 'T' }],
      true,
    );
    const p = planLayer(d, 2);
    const n = 1_000_000;
    const grid = Float64Array.from({ length: n }, (_, i) => (230 * i) / (n - 1));
    const y = monitorCurve(d, 2, grid);
    const brute: number[] = [];
    for (let i = 1; i < n - 1; i++) if ((y[i] - y[i - 1]) * (y[i + 1] - y[i]) < 0) brute.push(grid[i]);
    expect(p.turningPointList.map((t) => t.thicknessNm)).toHaveLength(brute.length);
    p.turningPointList.forEach((t, i) => expect(Math.abs(t.thicknessNm - brute[i])).toBeLessThan(2 * (230 / n)));
    expect(brute.length).toBeGreaterThanOrEqual(3);
    // with absorption and a non-quarter-wave stack below, extrema are not at multiples of λ/4n
    const qw = 600 / (4 * 2.2);
    expect(Math.abs(p.turningPointList[0].thicknessNm / qw - Math.round(p.turningPointList[0].thicknessNm / qw))).toBeGreaterThan(1e-3);
  });
});

describe('signal, swing and slope', () => {
  // Single film on a substrate (Born & Wolf, Principles of Optics §1.6.4):
  // R = (r01² + r12² + 2r01r12 cos2δ)/(1 + r01²r12² + 2r01r12 cos2δ), δ = 2πnd/λ.
  const n1 = 1.9, ns = 1.52, wl = 600;
  const r01 = (1 - n1) / (1 + n1), r12 = (n1 - ns) / (n1 + ns);
  const airy = (dNm: number) => {
    const c = Math.cos((4 * Math.PI * n1 * dNm) / wl);
    return (r01 ** 2 + r12 ** 2 + 2 * r01 * r12 * c) / (1 + r01 ** 2 * r12 ** 2 + 2 * r01 * r12 * c);
  };
  const dAiry = (dNm: number) => (airy(dNm + 1e-5) - airy(dNm - 1e-5)) / 2e-5;
  const d = design({ M: { model: 'constant', n: 1.9 } }, [{ material: 'M', thicknessNm: 50, cut: 'level' }]);
  const p = planLayer(d, 1);

  it('start, cut and slope agree with the single-film Airy formula', () => {
    expect(p.startSignal).toBeCloseTo(airy(0), 12);
    expect(p.cutSignal).toBeCloseTo(airy(50), 12);
    expect(p.slopePerNm).toBeCloseTo(dAiry(50), 8);
  });

  it('swingPct is 100·(max − min)/max over the layer', () => {
    const ys = Array.from({ length: 5001 }, (_, i) => airy((50 * i) / 5000));
    const mx = Math.max(...ys), mn = Math.min(...ys);
    expect(p.swingPct).toBeCloseTo((100 * (mx - mn)) / mx, 6);
    expect(p.maxSignal).toBeCloseTo(mx, 10);
  });
});

describe('warnings (common-practice thresholds)', () => {
  const H = { H: { model: 'constant', n: 2.35 } };
  it('a level cut at 0.98 QW sits in the flat top of a turning point', () => {
    const p = planLayer(design(H, [{ material: 'H', qwot: 0.98, cut: 'level' }]), 1);
    expect(p.warnings.map((w) => w.code)).toEqual(['flat-level-cut']);
    expect(p.warnings[0].message).toMatch(/^layer 1 \(H, .* R at 600 nm, chip 1\): level cut in a flat stretch/);
  });
  it('a level cut at 0.5 QW (steepest) does not warn', () => {
    const p = planLayer(design(H, [{ material: 'H', qwot: 0.5, cut: 'level' }]), 1);
    expect(Math.abs(p.slopePerNm)).toBeGreaterThan(PLAN_THRESHOLDS.flatSlopePerNm);
    expect(p.warnings).toEqual([]);
  });
  it('a turning-point cut where the curve does not turn is flagged with the nearest turning point', () => {
    const p = planLayer(design(H, [{ material: 'H', qwot: 0.8 }]), 1);
    expect(p.turningPoints).toBe(0);
    expect(p.warnings[0].code).toBe('cut-not-at-turning-point');
    expect(p.warnings[0].message).toMatch(/nearest turning point at 63\.83 nm, 20\.0 % QW away/);
  });
  it('a layer almost matched to the substrate swings too little', () => {
    const p = planLayer(design({ M: { model: 'constant', n: 1.56 } }, [{ material: 'M', qwot: 1, mode: 'T' }]), 1);
    expect(p.swingPct).toBeLessThan(2);
    expect(p.warnings.map((w) => w.code)).toEqual(['small-swing']);
  });
  it('a layer exactly matched to the substrate has a flat curve and no turning points', () => {
    const p = planLayer(design({ M: { model: 'constant', n: 1.52 } }, [{ material: 'M', qwot: 1 }]), 1);
    expect(p.turningPoints).toBe(0);
    expect(p.swingPct).toBeCloseTo(0, 10);
  });
});
