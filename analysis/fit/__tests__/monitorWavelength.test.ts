import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const design = (name: string) => parseDesign(JSON.parse(readFileSync(path.join(samples, name), 'utf8')), name);
/** The mirror's first layer alone: every design layer then has samples in the single-layer trace. */
const mirrorLayer1 = () => {
  const json = JSON.parse(readFileSync(path.join(samples, 'hr17-mirror-600.json'), 'utf8'));
  return parseDesign({ ...json, layers: json.layers.slice(0, 1) }, 'hr17 layer 1');
};
const trace = (name: string) => readTraceText(readFileSync(path.join(samples, name), 'utf8'), { fileName: name });

describe('a trace analysed against another design', () => {
  it('warns when the trace states a monitor wavelength the design does not use', async () => {
    const result = await analyzeRun(mirrorLayer1(), await trace('bay1-ar1-run0412.csv'));
    expect(result.warnings.some((w) => /states monitor_wavelength_nm 550, but the design monitors layer 1 at 600 nm/.test(w))).toBe(true);
  });

  it('flags a fitted thickness that is not physical', async () => {
    const result = await analyzeRun(mirrorLayer1(), await trace('bay1-ar1-run0412.csv'));
    const layer = result.layers[0];
    expect(layer.thicknessNm).toBeLessThanOrEqual(0);
    expect(layer.warnings).toContain('the fitted thickness is not physical (≤ 0 nm): the model does not describe this layer (wrong design, stack below, or segmentation?)');
    const good = await analyzeRun(design('ar1-mgf2-crown.json'), await trace('bay1-ar1-run0412.csv'));
    expect(good.layers[0].warnings.filter((w) => w.includes('not physical'))).toEqual([]);
  });

  it('stays quiet when they agree', async () => {
    const result = await analyzeRun(design('ar1-mgf2-crown.json'), await trace('bay1-ar1-run0412.csv'));
    expect(result.warnings.filter((w) => w.includes('monitor_wavelength_nm'))).toEqual([]);
  });
});
