import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText, segmentTrace } from '../../trace';
import { gatherLayerSamples } from '../layerSamples';
import { chipColumnWarnings } from '../chipColumnCheck';

// A logger whose chip column was not kept up: the hr17 mirror's trace (chips 1 and 2, the change
// before layer 11) with the column at 1 throughout used to crash the analysis ("Invalid typed
// array length": layer 11, fitted on chip 1's ten layers, read 4·10¹¹ nm, and its turning points
// were sought on a grid that long).
const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const design = (name: string) => parseDesign(JSON.parse(readFileSync(path.join(samples, name), 'utf8')), name);
const text = (name: string) => readFileSync(path.join(samples, name), 'utf8');
/** The trace with its chip column (the last field) rewritten, layer by layer. */
const withChips = (csv: string, chip: (layer: number, chip: number) => number) =>
  csv.split('\n').map((l) => {
    if (!/^\d/.test(l)) return l;
    const f = l.split(',');
    f[3] = String(chip(Number(f[2]), Number(f[3])));
    return f.join(',');
  }).join('\n');

describe("the trace's chip column against the design's chips", () => {
  it('a column left at the first chip through the chip change: analysed, the cause said, the wild layers flagged', async () => {
    const head = text('bay3-hr17-run1120.csv').split('\n').find((l) => l.startsWith('time_s'));
    expect(head).toBe('time_s,signal,layer,chip');
    const trace = await readTraceText(withChips(text('bay3-hr17-run1120.csv'), () => 1), { fileName: 'one-chip.csv' });
    const result = await analyzeRun(design('hr17-mirror-600.json'), trace, { mode: 'sequential' });
    expect(result.warnings).toContain("the design puts layer 11 on a fresh chip (2), but the trace's chip column stays at 1: it is analysed on the stack of layers up to 10, as the column says; if the chip was changed, the column is wrong");
    const l11 = result.layers.find((l) => l.layer === 11)!;
    expect(l11.thicknessNm).toBeGreaterThan(10 * l11.designThicknessNm);
    expect(l11.warnings.some((w) => /^the fitted thickness \(.+ nm\) is more than 10× the design's/.test(w))).toBe(true);
    // chip 1's own layers are untouched by it
    expect(result.layers.filter((l) => l.layer <= 10).every((l) => Math.abs(l.thicknessNm / l.designThicknessNm - 1) < 0.1)).toBe(true);
  });

  it('a column that changes chip where the design does not', async () => {
    const bbar = design('bbar4-visible.json');
    const trace = await readTraceText(withChips(text('bay2-bb4-run0587.csv'), (layer, chip) => (layer >= 3 ? 2 : chip)), { fileName: 'two-chips.csv' });
    const samplesOf = (t: typeof trace) => gatherLayerSamples(t, segmentTrace(t).layers);
    expect(chipColumnWarnings(bbar, trace, samplesOf(trace))).toEqual([
      "the trace's chip column changes from 1 to 2 at layer 3, where the design keeps chip 1: it is analysed on a bare chip, as the column says",
    ]);
    const asLogged = await readTraceText(text('bay2-bb4-run0587.csv'), { fileName: 'as-logged.csv' });
    expect(chipColumnWarnings(bbar, asLogged, samplesOf(asLogged))).toEqual([]);
  });
});
