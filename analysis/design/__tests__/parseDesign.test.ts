import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DesignFormatError, parseDesign } from '..';
import { materialLibrary } from '../../materials';

const fixture = (name: string): unknown => JSON.parse(readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8'));

const minimal = () => ({
  format: 'fringelog.design/1',
  name: 'one layer',
  referenceWavelengthNm: 550,
  substrate: { model: 'constant', n: 1.52 },
  materials: { L: { model: 'constant', n: 1.38 } },
  layers: [{ material: 'L', qwot: 1, monitor: { wavelengthNm: 550, mode: 'R', chip: 1, cut: 'turning-point' } }],
});

function errorOf(json: unknown, fileName = 'coat.json'): DesignFormatError {
  try {
    parseDesign(json, fileName);
  } catch (e) {
    expect(e).toBeInstanceOf(DesignFormatError);
    return e as DesignFormatError;
  }
  throw new Error('parseDesign accepted the input');
}

describe('parseDesign', () => {
  it('reads the 4-layer example: defaults, layer numbers, materials', () => {
    const d = parseDesign(fixture('ar4-visible.json'), 'ar4-visible.json');
    expect(d.name).toBe('Larkspur LV-AR4 visible antireflection, 4 layers');
    expect(d.substrateBackside).toBe(true);
    expect(d.ambient).toBe(materialLibrary.vacuum.model);
    expect(d.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
    expect(d.layers[0]).toMatchObject({ material: 'H', thicknessNm: 15.6, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'level' } });
    expect(d.layers[0].qwot).toBeCloseTo((4 * 2.1 * 15.6) / 550, 12);
  });

  it('QWOT → thickness: t = λ/(4n) = 550/(4·1.38) = 99.64 nm for one quarter-wave (Macleod, Thin-Film Optical Filters, ch. 3)', () => {
    const d = parseDesign(minimal());
    expect(d.layers[0].thicknessNm).toBeCloseTo(99.6377, 4);
    expect(d.layers[0].qwot).toBe(1);
  });

  it('QWOT of a dispersive material uses n at the reference wavelength, not the monitor wavelength', () => {
    const json = minimal();
    json.materials.L = materialLibrary['fused-silica'].model as never;
    json.layers[0].monitor.wavelengthNm = 400;
    const d = parseDesign(json);
    expect(d.layers[0].thicknessNm).toBeCloseTo(550 / (4 * 1.459910), 3);
  });

  it('resolves built-in names for ambient, substrate, materials and directly in a layer', () => {
    const json = { ...minimal(), ambient: 'air', substrate: 'fused-silica', materials: { L: 'MgF2' } } as Record<string, unknown>;
    (json.layers as { material: string }[]).push({ ...minimal().layers[0], material: 'TiO2' });
    const d = parseDesign(json);
    expect(d.substrate).toBe(materialLibrary['fused-silica'].model);
    expect(d.materials.L).toBe(materialLibrary.MgF2.model);
    expect(d.materials.TiO2).toBe(materialLibrary.TiO2.model);
    expect(d.substrateBackside).toBe(false);
  });

  it('takes the name from the file when the design has none', () => {
    const { name: _, ...json } = minimal();
    expect(parseDesign(json, '/x/y/blue-edge.json').name).toBe('blue-edge');
  });

  it('accepts a design with no layers (bare substrate)', () => {
    expect(parseDesign({ ...minimal(), layers: [] }).layers).toEqual([]);
  });
});

describe('parseDesign errors name the file and the key', () => {
  const cases: [string, (j: ReturnType<typeof minimal>) => unknown, string, RegExp][] = [
    ['not an object', () => [1, 2], '', /^coat\.json: \(top level\): /],
    ['wrong format', (j) => ({ ...j, format: 'fringelog.design/2' }), 'format', /must be "fringelog\.design\/1"/],
    ['missing substrate', (j) => ({ ...j, substrate: undefined }), 'substrate', /is required/],
    ['negative reference wavelength', (j) => ({ ...j, referenceWavelengthNm: -5 }), 'referenceWavelengthNm', /> 0/],
    ['unknown top-level key', (j) => ({ ...j, substrateBackSide: true }), '', /unknown key "substrateBackSide"/],
    ['bad monitor mode', (j) => { (j.layers[0].monitor as { mode: string }).mode = 'X'; return j; }, 'layers[0].monitor.mode', /T|R/],
    // zod's English messages (analysis/materials/zodLocale.ts): without them, a bare "Invalid input"
    ['chip not a number', (j) => { (j.layers[0].monitor as { chip: unknown }).chip = 'one'; return j; }, 'layers[0].monitor.chip', /expected number, received string/],
    ['fractional chip', (j) => { j.layers[0].monitor.chip = 1.5; return j; }, 'layers[0].monitor.chip', /whole number/],
    ['both thickness and qwot', (j) => ({ ...j, layers: [{ ...j.layers[0], thicknessNm: 100 }] }), 'layers[0].qwot', /exactly one of/],
    ['neither thickness nor qwot', (j) => ({ ...j, layers: [{ material: 'L', monitor: j.layers[0].monitor }] }), 'layers[0].thicknessNm', /exactly one of/],
    ['absurd thickness', (j) => ({ ...j, layers: [{ ...j.layers[0], qwot: undefined, thicknessNm: 5e6 }] }), 'layers[0].thicknessNm', /≤ 100000 nm/],
    ['typo in a layer key', (j) => ({ ...j, layers: [{ ...j.layers[0], qwot: undefined, thicknesNm: 5 }] }), 'layers[0]', /unknown key "thicknesNm"/],
    ['unknown layer material', (j) => { j.layers[0].material = 'Q'; return j; }, 'layers[0].material', /"Q" is neither in "materials" nor built in/],
    ['unknown built-in name', (j) => ({ ...j, substrate: 'crown' }), 'substrate', /unknown material "crown"/],
    ['bad material model', (j) => ({ ...j, materials: { L: { model: 'cauchy', A: 1.4 } } }), 'materials.L.B', /./],
    ['table out of order', (j) => ({ ...j, materials: { L: { model: 'table', points: [[600, 1.38, 0], [500, 1.38, 0]] } } }), 'materials.L.points[1][0]', /strictly increasing/],
    ['monitor wavelength out of a material range', (j) => { j.materials.L = { model: 'table', points: [[500, 1.38, 0], [600, 1.38, 0]] } as never; j.layers[0].monitor.wavelengthNm = 700; return j; }, 'layers[0].monitor.wavelengthNm', /material "L".*700 nm is outside .* 500–600 nm/],
    ['reference wavelength out of range', (j) => ({ ...j, referenceWavelengthNm: 100, materials: { L: 'fused-silica' } }), 'layers[0].qwot', /referenceWavelengthNm: wavelength 100 nm/],
    ['absorbing ambient', (j) => ({ ...j, ambient: { model: 'constant', n: 1, k: 0.1 } }), 'ambient', /non-absorbing/],
    ['absorbing thick substrate', (j) => ({ ...j, substrateBackside: true, substrate: { model: 'constant', n: 1.5, k: 0.01 } }), 'substrate', /non-absorbing/],
  ];
  for (const [what, mutate, path, message] of cases) {
    it(what, () => {
      const e = errorOf(mutate(minimal()));
      expect(e.path).toBe(path);
      expect(e.fileName).toBe('coat.json');
      expect(e.message).toMatch(message);
      expect(e.message.startsWith(`coat.json: ${path === '' ? '(top level)' : path}: `)).toBe(true);
    });
  }
});
