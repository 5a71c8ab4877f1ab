import { describe, expect, it } from 'vitest';
import { readTraceRows } from '../readTrace';
import { type TraceData } from '../types';

const ROWS = 150_000;

/** A trace CSV of ROWS rows (time's digits grow along it) as byte chunks of 64 KiB, or as text chunks. */
function csv(): string {
  const lines = ['# chamber: test', 'time_s,signal,layer,chip'];
  for (let i = 0; i < ROWS; i++) lines.push(`${(i * 0.01 - 0.5).toFixed(3)},${(0.5 + 0.4 * Math.sin(i / 700)).toFixed(6)},${Math.floor(i / 10_000)},${1 + Math.floor(i / 50_000)}`);
  return `${lines.join('\n')}\n`;
}
const text = csv();
const bytes = new TextEncoder().encode(text);
const byteChunks = () => Array.from({ length: Math.ceil(bytes.length / 65_536) }, (_, k) => bytes.subarray(k * 65_536, (k + 1) * 65_536));
const textChunks = () => Array.from({ length: Math.ceil(text.length / 65_536) }, (_, k) => text.slice(k * 65_536, (k + 1) * 65_536));

const columns = (t: TraceData) => ({ rowCount: t.rowCount, timeS: Array.from(t.timeS), signal: Array.from(t.signal), layer: Array.from(t.layer!), chip: Array.from(t.chip!), warnings: t.warnings });
/** Rows the columns have room for (the shared columns are views of their storage). */
const capacity = (t: TraceData) => t.timeS.buffer.byteLength / 8;

describe('readTraceRows sized from the input (ReadTraceOptions.expectedBytes)', () => {
  it('reads the same samples, its columns sized once for the rows the bytes hold (not grown by doubling)', async () => {
    for (const chunks of [byteChunks, textChunks]) {
      const grown = await readTraceRows(chunks(), {}, true);
      const sized = await readTraceRows(chunks(), { expectedBytes: bytes.length }, true);
      expect(columns(sized)).toEqual(columns(grown));
      expect(sized.rowCount).toBe(ROWS);
      // doubling from 1024 rows: 1024·2^8 = 262144 rows of room for 150 000
      expect(capacity(grown)).toBe(262_144);
      // sized from the first chunk's bytes a row (its rows' times are shorter than the last ones'), with a twentieth to spare
      expect(capacity(sized)).toBeGreaterThanOrEqual(ROWS);
      expect(capacity(sized)).toBeLessThan(1.2 * ROWS);
      expect(sized.layer!.buffer.byteLength / 4).toBe(capacity(sized));
    }
  });

  it('reads the same samples when the size is wrong (too small: grown from there; too large: room to spare)', async () => {
    const grown = columns(await readTraceRows(byteChunks(), {}, true));
    for (const expectedBytes of [bytes.length / 3, bytes.length * 3, 10]) {
      expect(columns(await readTraceRows(byteChunks(), { expectedBytes }, true))).toEqual(grown);
    }
  });
});
