import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';

// A constant added to every reading (a detector's pedestal) cancels where the trace holds a dark
// reading: the offset is read from it. The demo's four-layer AR opens on 10 s of dark (about
// 0.004) before 20 s of bare chip (1.785).
const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const bbar = parseDesign(JSON.parse(readFileSync(path.join(samples, 'bbar4-visible.json'), 'utf8')), 'bbar4-visible.json');
const text = readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8');
const withPedestal = (p: number) => text.split('\n').map((l) => (/^\d/.test(l) ? l.replace(/^([^,]+),([^,]+)/, (_, t, s) => `${t},${(Number(s) + p).toFixed(6)}`) : l)).join('\n');
const analyse = async (csv: string) => analyzeRun(bbar, await readTraceText(csv, { fileName: 'pedestal.csv' }), { mode: 'sequential' });

describe("a detector's pedestal", () => {
  it('changes nothing where the dark reading is taken as one (pedestal 0.1, 6 % of the bare reading)', async () => {
    const [plain, raised] = await Promise.all([analyse(text), analyse(withPedestal(0.1))]);
    expect(raised.chips[0].offsetSource).toBe('dark');
    expect(raised.chips[0].offset - plain.chips[0].offset).toBeCloseTo(0.1, 6);
    raised.layers.forEach((l, j) => {
      expect(l.thicknessNm).toBeCloseTo(plain.layers[j].thicknessNm, 4);
      expect(l.index).toBeCloseTo(plain.layers[j].index, 6);
    });
    expect(raised.warnings.filter((w) => w.includes('steady reading'))).toEqual([]);
  });

  it('says so where a steady low level was not taken as dark (pedestal 1.0: the dark at 36 % of the bare reading)', async () => {
    const raised = await analyse(withPedestal(1));
    expect(raised.chips[0].offsetSource).not.toBe('dark');
    expect(raised.warnings).toContain(
      "chip 1: a steady reading of 1.004 before its bare chip's 2.785 (36 % of it) was not taken as the dark reading, which lies under 30 % of the bare chip's: "
      + "if the beam was blocked then, the detector's offset is 1.004, not the 0 taken, and this chip's figures are off",
    );
    expect(JSON.stringify(raised.chips)).not.toContain('lowLevelNotDark');
  });
});
