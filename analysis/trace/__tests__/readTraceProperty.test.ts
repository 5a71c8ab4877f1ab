import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readTrace, readTraceText } from '../readTrace';

/** The text's UTF-8 bytes cut at the given places (each taken modulo the length). */
function chunked(text: string, cuts: number[]): Uint8Array[] {
  const bytes = new TextEncoder().encode(text);
  const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
  const chunks: Uint8Array[] = [];
  let from = 0;
  for (const p of [...points, bytes.length]) {
    chunks.push(bytes.subarray(from, p));
    from = p;
  }
  return chunks;
}

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
          const chunks = chunked(text, cuts);
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

  it('rows with faults and mixed line ends among good ones: bytes read as their text is, same samples or same message', async () => {
    // the byte path reads most rows in one pass to their line end (traceParser.ts fastRow); every
    // row it refuses must then read, or fail, as the text path (line by line) reads it
    const good = fc.tuple(fc.nat({ max: 60 }), fc.double({ min: -10, max: 10, noNaN: true }).map((v) => v + 0));
    const line = fc.oneof(
      { weight: 8, arbitrary: good.map(([l, s]) => ({ kind: 'good' as const, l, s })) },
      {
        weight: 1,
        arbitrary: fc.constantFrom(
          '', '# note', '3,,1', '3,0.5', '3,0.5,1,9', 'x,0.5,1', '3,0.5e,1', '3,1e400,1', '3, 0.5,1', '3,0.5 ,1',
          '3,0.5\r,1', '3,µ,1', '99,0.5,1', '-1,0.5,1', '2.5,0.5,1', '3,0.5,0', '3,0x1A,1', '3,+.5,1', '3,5.,1', 'back',
        ).map((text) => ({ kind: 'raw' as const, text })),
      },
    );
    await fc.assert(
      fc.asyncProperty(
        fc.array(line, { minLength: 1, maxLength: 40 }),
        fc.array(fc.constantFrom('\n', '\r\n'), { minLength: 1, maxLength: 40 }),
        fc.array(fc.nat({ max: 2000 }), { maxLength: 6 }),
        async (lines, eols, cuts) => {
          let t = 0;
          const body = lines.map((x, i) => {
            t += 0.25;
            const text =
              x.kind === 'good' ? `${x.l},${x.s},${t}` : x.text === 'back' ? `3,0.5,${t - 0.4}` : x.text.replace(',1', `,${t}`).replace(/,0$/, `,${t}`);
            return text + eols[i % eols.length];
          });
          const text = `layer,signal,time_s\n${body.join('')}`;
          const chunks = chunked(text, cuts);
          const opts = { minLayerSamples: 0, layerCount: 60, fileName: 'run.csv' };
          const outcome = (p: Promise<Awaited<ReturnType<typeof readTrace>>>) =>
            p.then(
              (tr) => ({ t: Array.from(tr.timeS), s: Array.from(tr.signal), l: Array.from(tr.layer!), w: tr.warnings.map((w) => w.message) }),
              (e: Error) => e.message,
            );
          expect(await outcome(readTrace(chunks, opts))).toEqual(await outcome(readTraceText(text, opts)));
        },
      ),
      { numRuns: 300, seed: 11 },
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
