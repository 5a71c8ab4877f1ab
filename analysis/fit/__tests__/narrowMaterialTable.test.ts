import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';

// The run's spectrum (400–800 nm) is a by-product: a material measured over the monitor's
// wavelengths only used to fail the whole analysis ("wavelength 400 nm is outside the material's
// valid range 500–700 nm").
const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const doc = JSON.parse(readFileSync(path.join(samples, 'bbar4-visible.json'), 'utf8'));
const narrow = parseDesign({ ...doc, materials: { ...doc.materials, L: { model: 'table', points: [[500, 1.462, 0], [600, 1.458, 0], [700, 1.455, 0]] } } }, 'narrow.json');

describe('a design whose material is known over part of the spectrum only', () => {
  it('is analysed, its spectrum shown where every material has an index, and says so', async () => {
    const trace = await readTraceText(readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8'), { fileName: 'bay2-bb4-run0587.csv' });
    const result = await analyzeRun(narrow, trace, { mode: 'sequential' });
    expect(result.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
    expect(result.spectrum.wavelengthNm[0]).toBe(500);
    expect(result.spectrum.wavelengthNm.at(-1)).toBe(700);
    expect(result.spectrum.asBuiltT.length).toBe(result.spectrum.wavelengthNm.length);
    expect(result.spectrum.designR.length).toBe(result.spectrum.wavelengthNm.length);
    expect(result.warnings).toContain('spectrum shown over 500–700 nm only (material "L": wavelength 400 nm is outside the material\'s valid range 500–700 nm)');
  });
});
