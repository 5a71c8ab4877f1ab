import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';
import { AnalysisInputError } from '../AnalysisInputError';

// A monitor that saw nothing (lamp off, the wrong channel logged, light lost mid-layer) used to
// get thicknesses fitted to a flat line, with σ from the model's shape: on the demo's four-layer
// AR with every reading set to 0.5, layer 1 came out 8.69 ± 0.80 nm and "cut thin by 7.8 %".
const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const bbar = parseDesign(JSON.parse(readFileSync(path.join(samples, 'bbar4-visible.json'), 'utf8')), 'bbar4-visible.json');
const text = readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8');

/** The demo trace with each data row's signal replaced (row fields by the header's names). */
function withSignal(signal: (row: Record<string, string>, i: number) => string): string {
  const lines = text.split('\n');
  const header = lines.findIndex((l) => l !== '' && !l.startsWith('#'));
  const cols = lines[header].split(',');
  const at = cols.indexOf('signal');
  let i = 0;
  return lines.map((l, k) => {
    if (k <= header || l === '') return l;
    const f = l.split(',');
    f[at] = signal(Object.fromEntries(cols.map((c, j) => [c, f[j]])), i++);
    return f.join(',');
  }).join('\n');
}

async function rejection(csv: string): Promise<AnalysisInputError> {
  const trace = await readTraceText(csv, { fileName: 'edited.csv' });
  const err = await analyzeRun(bbar, trace, { mode: 'sequential' }).then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(AnalysisInputError);
  return err as AnalysisInputError;
}

// The thresholds (a 20σ expected swing, a 6σ 2–98 % range; pure normal noise spans about 4.1σ
// there, from memory) are layersSeen.ts's; these checks are of behaviour on edited demo traces.
describe('layers the monitor did not see grow', () => {
  it('fails a run whose readings never change, naming every layer', async () => {
    const err = await rejection(withSignal(() => '0.500000'));
    expect(err.code).toBe('layer_not_seen');
    expect(err.layers).toEqual([1, 2, 3, 4]);
    expect(err.message).toMatch(/^the monitor did not see 4 of the design's 4 layers grow: layers 1, 2, 3, 4 \(H, L, H, L\): their readings did not change at all while they grew, where the design expects swings of 0\.0\d+–0\.0\d+: no light on the detector, or nothing was deposited$/);
  });

  it('fails a chip that reads no light (all zeros, or a sign inverted), once for the chip', async () => {
    for (const signal of [() => '0', (r: Record<string, string>) => String(-Number(r.signal))]) {
      const err = await rejection(withSignal(signal));
      expect(err.layers).toEqual([1, 2, 3, 4]);
      expect(err.message).toMatch(/: chip 1 \(layers 1, 2, 3, 4\): its readings carry no light above the offset \(gain -?[\d.]+ from layer 1's first readings, offset 0\)/);
    }
  });

  it('names the one layer during which the light was lost', async () => {
    // The first 100 rows are the dark reading before the bare chip (0.0039–0.0050): layer 3's
    // rows read those in turn, as if the beam were blocked while it grew.
    const dark = text.split('\n').filter((l) => /^\d/.test(l)).slice(0, 100).map((l) => l.split(',')[1]);
    expect(Math.max(...dark.map(Number))).toBeLessThan(0.01);
    const err = await rejection(withSignal((r, i) => (r.layer === '3' ? dark[i % dark.length] : r.signal)));
    expect(err.layers).toEqual([3]);
    expect(err.message).toMatch(/layer 3 \(H\): its readings stayed within the noise while it grew \(2–98 % range [\d.e-]+, [\d.]+× the noise σ [\d.e-]+\), where the design expects a swing of [\d.]+: no light on the detector, or nothing was deposited$/);
  });

  it('passes the demo trace as logged', async () => {
    const result = await analyzeRun(bbar, await readTraceText(text, { fileName: 'bay2-bb4-run0587.csv' }), { mode: 'sequential' });
    expect(result.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
  });
});
