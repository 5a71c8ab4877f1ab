import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import ar4 from '@/analysis/design/__tests__/fixtures/ar4-visible.json';
import { editorReducer, fromDocument, toDocument, FROM_FILE } from '../editorState';

describe('the design editor state', () => {
  it('gives back the document it was made from', () => {
    expect(parseDesign(toDocument(fromDocument(ar4)))).toEqual(parseDesign(ar4));
  });

  it('adds, duplicates, moves and removes layers', () => {
    let s = fromDocument(ar4);
    const n = s.layers.length;
    s = editorReducer(s, { type: 'duplicate', index: 0 });
    expect(s.layers.length).toBe(n + 1);
    expect(s.layers[1]).toMatchObject({ material: s.layers[0].material, thickness: s.layers[0].thickness });
    expect(s.layers[1].id).not.toBe(s.layers[0].id);
    const second = s.layers[2].id;
    s = editorReducer(s, { type: 'move', index: 2, by: -1 });
    expect(s.layers[1].id).toBe(second);
    expect(editorReducer(s, { type: 'move', index: 0, by: -1 })).toBe(s);
    s = editorReducer(s, { type: 'remove', index: 0 });
    s = editorReducer(s, { type: 'add' });
    expect(s.layers.length).toBe(n + 1);
    expect(s.layers.at(-1)).toMatchObject({ thickness: '1', unit: 'qwot', chip: s.layers.at(-2)!.chip });
  });

  it('sends text that is not a number as it is, so the server names the key', () => {
    let s = fromDocument(ar4);
    s = editorReducer(s, { type: 'layer', index: 1, patch: { thickness: '-5', unit: 'nm' } });
    expect(() => parseDesign(toDocument(s))).toThrow('layers[1].thicknessNm: must be a finite number > 0');
    s = editorReducer(s, { type: 'layer', index: 1, patch: { thickness: 'abc' } });
    expect(() => parseDesign(toDocument(s))).toThrow(/layers\[1\]\.thicknessNm/);
  });

  it('keeps a substrate model from the file, and per-layer tolerances only where given', () => {
    const doc = { ...ar4, substrate: { model: 'constant', n: 1.6 } };
    let s = fromDocument(doc);
    expect(s.substrate).toBe(FROM_FILE);
    s = editorReducer(s, { type: 'layer', index: 0, patch: { tolThicknessPct: '1.5' } });
    const out = toDocument(s);
    expect(out.substrate).toEqual({ model: 'constant', n: 1.6 });
    const layers = out.layers as { tolerance?: unknown }[];
    expect(layers[0].tolerance).toEqual({ thicknessPct: 1.5 });
    expect(layers[1].tolerance).toBeUndefined();
    expect(parseDesign(out).layers[0].tolerance.thicknessPct).toBe(1.5);
  });
});
