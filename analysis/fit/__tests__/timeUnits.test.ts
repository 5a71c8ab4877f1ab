import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { readTraceText } from '../../trace';
import { timeUnitWarning } from '../timeUnits';

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');
const bbar = parseDesign(JSON.parse(readFileSync(path.join(samples, 'bbar4-visible.json'), 'utf8')), 'bbar4-visible.json');
const text = readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8');
/** The demo trace with every time stamp scaled (as a logger writing milliseconds or minutes would). */
const scaledTimes = (k: number) => text.split('\n').map((l) => (/^\d/.test(l) ? l.replace(/^[^,]+/, (t) => (Number(t) * k).toFixed(6)) : l)).join('\n');

describe('times logged in another unit than seconds', () => {
  // The band, 0.01–10 nm/s for evaporated and sputtered optical films, is common practice, not a
  // published figure (timeUnits.ts); the checks below hold the code to its own widened edges.
  it('says nothing of rates within coating practice (0.01–10 nm/s), even at its edges', () => {
    expect(timeUnitWarning([0.25, 0.5, 0.31, 0.6])).toBeNull();
    expect(timeUnitWarning([0.003, 0.02])).toBeNull();
    expect(timeUnitWarning([8, 20])).toBeNull();
    expect(timeUnitWarning([])).toBeNull();
  });

  it('asks whether time_s is in seconds where the median rate lies far outside it', () => {
    expect(timeUnitWarning([0.00024, 0.00062, 0.00026, 0.0006])).toMatch(/^the layers grew at a median 0\.00043 nm\/s, where coating processes run at about 0\.01–10 nm\/s: is the trace's time_s column in seconds\?/);
    // one odd layer does not speak for the run: the median does
    expect(timeUnitWarning([0.0002, 0.3, 0.5])).toBeNull();
    expect(timeUnitWarning([15, 37, 16, 44])).toMatch(/median 27 nm\/s/);
  });

  it('warns first on the demo run logged in milliseconds, not on it as logged', async () => {
    const ms = await analyzeRun(bbar, await readTraceText(scaledTimes(1000), { fileName: 'ms.csv' }), { mode: 'sequential' });
    expect(ms.warnings[0]).toMatch(/^the layers grew at a median 0\.000\d+ nm\/s/);
    const s = await analyzeRun(bbar, await readTraceText(text, { fileName: 'bay2-bb4-run0587.csv' }), { mode: 'sequential' });
    expect(s.warnings.filter((w) => w.includes('time_s'))).toEqual([]);
  });
});
