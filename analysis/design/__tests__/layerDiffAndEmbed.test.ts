import { describe, expect, it } from 'vitest';
import { embedMaterials } from '../embedMaterials';
import { layerDiff } from '../layerDiff';
import { parseDesign } from '../parseDesign';
import { type MaterialModel } from '../../materials/schema';

const monitor = { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' };
const doc = (layers: unknown[], materials: Record<string, unknown> = { H: 'Ta2O5', L: 'SiO2' }) => ({
  format: 'fringelog.design/1',
  name: 'diff',
  referenceWavelengthNm: 550,
  substrate: 'crown-glass-1.52',
  materials,
  layers,
});

describe('layerDiff', () => {
  it('names what changed, what was added and what was removed, layer by layer', () => {
    const a = parseDesign(doc([{ material: 'H', qwot: 1, monitor }, { material: 'L', qwot: 1, monitor }, { material: 'H', qwot: 1, monitor }]));
    const b = parseDesign(doc([{ material: 'H', qwot: 1, monitor }, { material: 'L', qwot: 1.2, monitor: { ...monitor, mode: 'R' } }]));
    const rows = layerDiff(a, b);
    expect(rows.map((r) => r.kind)).toEqual(['same', 'changed', 'removed']);
    expect(rows[1].changes).toEqual(['thickness', 'monitor mode']);
    expect(layerDiff(b, a)[2]).toMatchObject({ kind: 'added', a: null, b: 3 });
  });
});

describe('embedMaterials', () => {
  const shop: Record<string, MaterialModel> = { 'LK-SiO2': { model: 'constant', n: 1.47, k: 0 }, 'LK-glass': { model: 'constant', n: 1.5, k: 0 } };
  const lookup = (name: string) => shop[name];

  it('writes shop materials in as models, keeps built-ins and models as they are, and records where each came from', () => {
    const input = { ...doc([{ material: 'LK-SiO2', qwot: 1, monitor }, { material: 'H', qwot: 1, monitor }, { material: 'L', qwot: 1, monitor }], { H: 'Ta2O5', L: 'LK-SiO2' }), substrate: 'LK-glass' };
    const out = embedMaterials(input, lookup) as Record<string, unknown>;
    expect(out.materials).toEqual({ H: 'Ta2O5', L: shop['LK-SiO2'], 'LK-SiO2': shop['LK-SiO2'] });
    expect(out.substrate).toEqual(shop['LK-glass']);
    expect(out.materialOrigins).toEqual({ L: 'LK-SiO2', 'LK-SiO2': 'LK-SiO2', substrate: 'LK-glass' });
    // the input is not touched, and the result parses with no database at all
    expect(input.substrate).toBe('LK-glass');
    expect(parseDesign(out).layers[0].thicknessNm).toBeCloseTo(550 / (4 * 1.47), 9);
  });

  it('takes an earlier copy again from the shop, so a new revision uses the material as it is now', () => {
    const first = embedMaterials(doc([{ material: 'LK-SiO2', qwot: 1, monitor }]), lookup);
    const changed: Record<string, MaterialModel> = { ...shop, 'LK-SiO2': { model: 'constant', n: 1.46, k: 0 } };
    const second = embedMaterials(first, (name) => changed[name]) as { materials: Record<string, unknown> };
    expect(second.materials['LK-SiO2']).toEqual({ model: 'constant', n: 1.46, k: 0 });
    expect((first as { materials: Record<string, unknown> }).materials['LK-SiO2']).toEqual(shop['LK-SiO2']);
    // a model the file wrote itself (no origin) is left alone
    const own = embedMaterials(doc([{ material: 'LK-SiO2', qwot: 1, monitor }], { 'LK-SiO2': { model: 'constant', n: 1.5 } }), lookup) as { materials: Record<string, unknown> };
    expect(own.materials['LK-SiO2']).toEqual({ model: 'constant', n: 1.5 });
  });

  it('leaves an unknown name for parseDesign to refuse at its key', () => {
    const out = embedMaterials(doc([{ material: 'nope', qwot: 1, monitor }]), lookup);
    expect(() => parseDesign(out)).toThrow(/layers\[0\]\.material: "nope" is neither in "materials" nor built in/);
  });
});
