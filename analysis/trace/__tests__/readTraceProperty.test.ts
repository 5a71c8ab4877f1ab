import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readTrace, readTraceText } from '../readTrace';

describe('readTrace: properties', () => {
  it('any finite values, any separator and line ending, any byte-level chunking: read back exactly', async () => {
    const row = fc.record({
      step: fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
      signal: fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((v) => v + 0), // String(-0) is "0"
      layer: fc.nat({ max: 60 }),
    });
    await fc.assert(
      fc.asyncProperty(
        fc.array(row, { minLength: 1, maxLength: 60 }),
        fc.constantFrom(',', '\t'),
        fc.constantFrom('\n', '\r\n'),
        fc.boolean(),
        fc.array(fc.nat({ max: 4000 }), { maxLength: 12 }),
        async (rows, sep, eol, bom, cuts) => {
          let t = 0;
          const times = rows.map((r) => (t += r.step));
          const text =
            (bom ? '\uFEFF' : '') +
            `# chamber: Bay 1 e-beam — µ${eol}layer${sep}signal${sep}time_s${eol}` +
            rows.map((r, i) => `${r.layer}${sep}${r.signal}${sep}${times[i]}`).join(eol) +
            eol;
          const bytes = new TextEncoder().encode(text);
          const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
          const chunks: Uint8Array[] = [];
          let from = 0;
          for (const p of [...points, bytes.length]) {
            chunks.push(bytes.subarray(from, p));
            from = p;
          }
          const trace = await readTrace(chunks, { minLayerSamples: 0 });
          expect(trace.meta.chamber).toBe('Bay 1 e-beam — µ');
          expect(Array.from(trace.timeS)).toEqual(times);
          expect(Array.from(trace.signal)).toEqual(rows.map((r) => r.signal));
          expect(Array.from(trace.layer!)).toEqual(rows.map((r) => r.layer));
        },
      ),
      { numRuns: 200, seed: 4 },
    );
  });

  it('warns about a malformed or repeated metadata line; refuses lone-CR line ends', async () => {
    const t = await readTraceText('# exported 2026-11-30\n# shift: A\n# shift: B\ntime_s,signal\n0,1\n');
    expect(t.meta).toEqual({ shift: 'B' });
    expect(t.warnings.map((w) => w.message)).toEqual([
      'line 1: metadata line is not "# key: value"; ignored',
      'line 3: metadata key "shift" repeated; the last value is kept',
    ]);
    await expect(readTraceText('time_s,signal\r0,1\r1,2\r', { fileName: 'mac.csv' })).rejects.toThrow(
      'mac.csv line 1: lines must end in LF or CRLF (found a lone CR)',
    );
  });
});
