import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { designSpectrum, designStackAt, layersOnChipBelow, monitorCurve, parseDesign, spectrumOfStack, wavelengthGrid } from '..';
import { fromNK } from '../../optics';
import { dispersion, type ChamberMaterial } from '@/tests/chamber/design';
import { stackRT } from '@/tests/chamber/thinFilm';

const load = (name: string) => parseDesign(JSON.parse(readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8')), name);

describe('layersOnChipBelow', () => {
  const d = load('hl7-reflector.json');
  it('a new chip starts bare; a returning chip continues its own stack', () => {
    expect(layersOnChipBelow(d, 1)).toEqual([]);
    expect(layersOnChipBelow(d, 3).map((l) => l.layer)).toEqual([1, 2]);
    expect(layersOnChipBelow(d, 4)).toEqual([]);
    expect(layersOnChipBelow(d, 5).map((l) => l.layer)).toEqual([4]);
    expect(layersOnChipBelow(d, 6).map((l) => l.layer)).toEqual([1, 2, 3]);
    expect(layersOnChipBelow(d, 7).map((l) => l.layer)).toEqual([1, 2, 3, 6]);
  });
  it('rejects a layer number outside the design', () => {
    expect(() => layersOnChipBelow(d, 0)).toThrow('layer 0 does not exist (the design has layers 1–7)');
    expect(() => layersOnChipBelow(d, 8)).toThrow(RangeError);
  });
});

describe('designStackAt', () => {
  const d = load('ar4-visible.json');
  it('evaluates each material at the wavelength, deposition order kept', () => {
    const s = designStackAt(d, 600);
    expect(s.layers.map((l) => l.thicknessNm)).toEqual([15.6, 35.8, 139.6, d.layers[3].thicknessNm]);
    expect(s.layers[0].n).toEqual(fromNK(2.1));
    expect(s.layers[1].n.re).toBeCloseTo(1.458, 3);
    expect(s.substrate).toEqual(fromNK(1.52));
  });
  it('as-built overrides: fixed index, scaled dispersion, partial stack', () => {
    const s = designStackAt(d, 600, [{ thicknessNm: 15 }, { thicknessNm: 30, indexScale: 1.01 }, { thicknessNm: 100, n: fromNK(2.0, 0.001) }]);
    expect(s.layers).toHaveLength(3);
    expect(s.layers[0]).toEqual({ n: fromNK(2.1), thicknessNm: 15 });
    expect(s.layers[1].n.re).toBeCloseTo(designStackAt(d, 600).layers[1].n.re * 1.01, 14);
    expect(s.layers[2].n).toEqual(fromNK(2.0, 0.001));
    expect(() => designStackAt(d, 600, new Array(5).fill({ thicknessNm: 1 }))).toThrow(/asBuilt has 5 layers, the design 4/);
  });
});

describe('designSpectrum', () => {
  const d = load('ar4-visible.json');
  it('matches the chamber simulator\'s own optics and dispersion (tests/chamber, no shared code) with the design backside', () => {
    const sp = designSpectrum(d, { fromNm: 420, toNm: 780, stepNm: 20 });
    expect(Array.from(sp.wavelengthNm)).toEqual(Array.from({ length: 19 }, (_, i) => 420 + 20 * i));
    sp.wavelengthNm.forEach((wl, i) => {
      const layers = d.layers.map((l) => ({ ...dispersion(d.materials[l.material] as ChamberMaterial, wl), thicknessNm: l.thicknessNm }));
      const r = stackRT(layers, wl, { ambient: 1, substrate: dispersion(d.substrate as ChamberMaterial, wl).n, backside: true });
      expect(sp.R[i]).toBeCloseTo(r.R, 12);
      expect(sp.T[i]).toBeCloseTo(r.T, 12);
      expect(sp.R[i] + sp.T[i]).toBeCloseTo(1, 12);
    });
  });
  it('the AR front face plus the bare back face stays within 0.55 % of the back face alone (4.26 %) across 440–660 nm', () => {
    const sp = designSpectrum(d, { fromNm: 440, toNm: 660, stepNm: 5 });
    for (const r of sp.R) {
      expect(r).toBeGreaterThan(0.0408);
      expect(r).toBeLessThan(0.048);
    }
  });
  it('a spectrum of the as-built stack differs from the design when a layer is off', () => {
    const asBuilt = d.layers.map((l, i) => ({ thicknessNm: l.thicknessNm * (i === 2 ? 1.05 : 1) }));
    const a = spectrumOfStack(d, asBuilt, { fromNm: 500, toNm: 600, stepNm: 50 });
    const b = designSpectrum(d, { fromNm: 500, toNm: 600, stepNm: 50 });
    expect(a.R[1]).not.toBeCloseTo(b.R[1], 4);
  });
  it('wavelengthGrid includes the end point and rejects bad grids', () => {
    expect(Array.from(wavelengthGrid(400, 400.3, 0.1))).toEqual([400, 400.1, 400.2, 400.3]);
    expect(wavelengthGrid(500, 500, 1)).toHaveLength(1);
    expect(() => wavelengthGrid(800, 400, 1)).toThrow('to (400 nm) must not be below from (800 nm)');
    expect(() => wavelengthGrid(400, 800, 0)).toThrow('step must be > 0 nm (got 0)');
    expect(() => wavelengthGrid(400, 800, 1e-6)).toThrow(/at most 1000000/);
  });
});

describe('monitorCurve', () => {
  it('equals the full stack of the chip at each thickness (chamber simulator optics, no shared code), including a returning chip', () => {
    const d = load('hl7-reflector.json');
    const ts = [0, 20, 50, 67.3];
    for (const layerNo of [1, 5, 6, 7]) {
      const curve = monitorCurve(d, layerNo, ts);
      const below = layersOnChipBelow(d, layerNo);
      ts.forEach((t, i) => {
        const layers = [...below.map((l) => ({ n: (d.materials[l.material] as { n: number }).n, k: 0, thicknessNm: l.thicknessNm })), { n: layerNo % 2 ? 2.35 : 1.46, k: 0, thicknessNm: t }];
        expect(curve[i]).toBeCloseTo(stackRT(layers, 633, { ambient: 1, substrate: 1.52, backside: false }).R, 12);
      });
    }
  });
  it('with backside T on the AR chip: starts at the bare-glass two-face value 91.832 % (Macleod ch. 2)', () => {
    const d = load('ar4-visible.json');
    expect(monitorCurve(d, 1, [0])[0]).toBeCloseTo(0.9183183, 6);
  });
  it('overrides replace the stack below and the growing index', () => {
    const d = load('ar4-visible.json');
    const a = monitorCurve(d, 2, [10, 20], { belowOverride: [{ n: fromNK(2.0), thicknessNm: 15 }], growingIndex: fromNK(1.45) });
    const s = (t: number) => stackRT([{ n: 2.0, k: 0, thicknessNm: 15 }, { n: 1.45, k: 0, thicknessNm: t }], 550, { ambient: 1, substrate: 1.52, backside: true }).T;
    expect(a[0]).toBeCloseTo(s(10), 12);
    expect(a[1]).toBeCloseTo(s(20), 12);
  });
});
