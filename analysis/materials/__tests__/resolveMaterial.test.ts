import { describe, expect, it } from 'vitest';
import { materialLibrary, resolveMaterial, UnknownMaterialError } from '..';

describe('resolveMaterial', () => {
  it('returns the library model for a built-in name and passes models through', () => {
    expect(resolveMaterial('fused-silica', 'substrate')).toBe(materialLibrary['fused-silica'].model);
    const m = { model: 'constant' as const, n: 1.7 };
    expect(resolveMaterial(m, 'materials.X')).toBe(m);
  });

  it('names the key path and the unknown name', () => {
    expect(() => resolveMaterial('unobtainium', 'materials.H')).toThrow(UnknownMaterialError);
    expect(() => resolveMaterial('unobtainium', 'materials.H')).toThrow(/^materials\.H: unknown material "unobtainium" \(built-in: vacuum, air, /);
  });

  it('does not resolve inherited object keys', () => {
    expect(() => resolveMaterial('toString', 'ambient')).toThrow(UnknownMaterialError);
  });
});
