import { describe, expect, it } from 'vitest';
import { readTrace } from '../readTrace';

const ROWS = 1_000_000;
const NOTE = 'shutter-open;crucible=2;sweep=on;beam=ok;'.padEnd(80, '.');

// a slow fringe with a deterministic ripple of 1e-4 standing in for noise (a noise-free peak
// quantised to 6 decimals would rightly look clipped)
const signalAt = (i: number) => 0.9 + 0.05 * Math.sin(i / 900) + 1e-4 * Math.sin(i * 2.399);

describe('readTrace on a large streamed input', () => {
  it('reads 10^6 rows (~100 MB) with heap growth far below the input size', async () => {
    const heap = () => process.memoryUsage().heapUsed;
    const base = heap();
    let peak = 0;
    let inputBytes = 0;
    const encoder = new TextEncoder();
    async function* generate() {
      let text = '# chamber: Bay 3 sputter\ntime_s,signal,layer,chip,note\n';
      for (let i = 0; i < ROWS; i++) {
        const layer = Math.floor(i / 25_000);
        text += `${(i * 0.1).toFixed(1)},${signalAt(i).toFixed(6)},${layer},${1 + (layer >= 20 ? 1 : 0)},${NOTE}\n`;
        if (text.length >= 65_536) {
          const bytes = encoder.encode(text);
          inputBytes += bytes.length;
          yield bytes;
          text = '';
          if (i % 64 === 0) peak = Math.max(peak, heap() - base);
        }
      }
      const bytes = encoder.encode(text);
      inputBytes += bytes.length;
      yield bytes;
    }
    const t = await readTrace(generate(), { fileName: 'big.csv' });
    peak = Math.max(peak, heap() - base);

    expect(inputBytes).toBeGreaterThan(100_000_000);
    expect(t.rowCount).toBe(ROWS);
    expect(t.timeS[ROWS - 1]).toBeCloseTo((ROWS - 1) * 0.1, 6);
    expect(t.signal[123_456]).toBe(Number(signalAt(123_456).toFixed(6)));
    expect(t.layer![ROWS - 1]).toBe(39);
    expect(t.chip![ROWS - 1]).toBe(2);
    expect(t.warnings.map((w) => w.code)).toEqual(['unknown_column']);
    // columns live in typed arrays outside the JS heap; a file held as one string would add ≥ 100 MB here
    expect(peak).toBeLessThan(60 * 1024 * 1024);
    expect(peak).toBeGreaterThan(0);
  });
});
