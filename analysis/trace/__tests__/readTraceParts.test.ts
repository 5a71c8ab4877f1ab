import { describe, expect, it } from 'vitest';
import { readTrace } from '../readTrace';
import { joinTraceParts, readTraceBytes, readTraceHead, readTraceTail, splitTrace, STREAM_CHUNK } from '../readTraceParts';
import type { ReadTraceOptions, TraceData } from '../types';

const encode = (s: string) => new TextEncoder().encode(s);

/** A trace of `rows` data rows after `preamble` (metadata lines and the header), lines ending in `eol`. */
function traceText(rows: number, { preamble = '# chamber: Bay 1\ntime_s,signal,layer,chip,note\n', eol = '\n', trailing = true } = {}): string {
  const lines: string[] = [];
  for (let i = 0; i < rows; i++) {
    const layer = 1 + Math.floor(i / 700);
    lines.push(`${(i * 0.05).toFixed(2)},${(0.9 + 0.05 * Math.sin(i / 90)).toFixed(6)},${layer},${1 + Math.floor(layer / 3)},ok`);
  }
  return preamble.replace(/\n/g, eol) + lines.join(eol) + (trailing ? eol : '');
}

/** The read on two threads, done here in turn: head, tail, join (null where the join declines). */
async function twoParts(bytes: Uint8Array, options: ReadTraceOptions): Promise<TraceData | null> {
  const split = splitTrace(bytes, { minBytes: 0 });
  if (!split) throw new Error('no split');
  const head = await readTraceHead(bytes, split, options);
  const tail = await readTraceTail(bytes, split, options);
  return head ? joinTraceParts(head, tail, options) : null;
}

/** The message a read rejects with. */
async function fault(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    return (e as Error).message;
  }
  return 'no fault';
}

describe('a trace read in two parts joins to the one-thread read', () => {
  const options = { fileName: 'run.csv', layerCount: 40 };

  it('every array and warning as the one-thread read, with LF and with CRLF line ends', async () => {
    // 30 malformed metadata lines: 20 listed, the rest counted in one warning (MAX_LISTED_WARNINGS)
    const preamble = '#\n'.repeat(30) + '# chamber: Bay 1\ntime_s,signal,layer,chip,note\n';
    for (const eol of ['\n', '\r\n']) {
      const bytes = encode(traceText(20_000, { preamble, eol }));
      const one = await readTraceBytes(bytes, options);
      const two = await twoParts(bytes, options);
      expect(two).toEqual(one);
      expect(one.warnings.map((w) => w.code)).toEqual([...Array(20).fill('metadata_malformed'), 'unknown_column', 'metadata_malformed_more']);
      expect(one.rowCount).toBe(20_000);
      // and as the streamed read with chunks of another size
      expect(two).toEqual(await readTrace([bytes.subarray(0, 1000), bytes.subarray(1000)], options));
    }
  });

  it('a file without a trailing newline', async () => {
    const bytes = encode(traceText(9_001, { trailing: false }));
    const two = await twoParts(bytes, options);
    expect(two).toEqual(await readTraceBytes(bytes, options));
    expect(two!.rowCount).toBe(9_001);
  });

  it('the tail numbers its lines as the file does: its fault names the line and column the one-thread read names', async () => {
    const lines = traceText(10_000).split('\n');
    // data row i sits on line 3 + i; spoil row 9000's signal, in the second half
    lines[2 + 9000] = lines[2 + 9000].replace(/^([^,]*),[^,]*/, '$1,abc');
    const bytes = encode(lines.join('\n'));
    const split = splitTrace(bytes, { minBytes: 0 })!;
    expect(split.at).toBeLessThan(bytes.length / 2 + 100);
    const one = await fault(readTraceBytes(bytes, options));
    expect(one).toMatch(/^run\.csv line 9003, column "signal"/);
    expect(await fault(readTraceTail(bytes, split, options))).toBe(one);
    // the head alone has no fault
    expect(await readTraceHead(bytes, split, options)).not.toBeNull();
  });

  it('time that goes back across the split, or rows past the row limit: the join declines (the whole is read)', async () => {
    const bytes = encode(traceText(10_000));
    const split = splitTrace(bytes, { minBytes: 0 })!;
    const head = (await readTraceHead(bytes, split, options))!;
    const tail = await readTraceTail(bytes, split, options);
    expect(joinTraceParts(head, tail, options)).not.toBeNull();
    expect(joinTraceParts(head, { ...tail, timeS: tail.timeS.map((t, i) => (i === 0 ? head.timeS[head.rowCount - 1] : t)) }, options)).toBeNull();
    expect(joinTraceParts(head, tail, { ...options, maxRows: 9_999 })).toBeNull();
    expect(await fault(readTraceBytes(bytes, { ...options, maxRows: 9_999 }))).toMatch(/row_limit|more than 9999 data rows/);
  });

  it('a blank line in the data past the split: the tail faults as the one-thread read does', async () => {
    const lines = traceText(10_000).split('\n');
    lines[2 + 8000] = '';
    const bytes = encode(lines.join('\n'));
    const split = splitTrace(bytes, { minBytes: 0 })!;
    expect(await fault(readTraceTail(bytes, split, options))).toBe(await fault(readTraceBytes(bytes, options)));
  });

  it('a split that lands on a comment line moves to the next data row; the head then names the fault', async () => {
    const lines = traceText(10_000).split('\n');
    const bytes0 = encode(lines.join('\n'));
    const mid = new TextDecoder().decode(bytes0.subarray(0, bytes0.length / 2)).split('\n').length - 1;
    lines[mid] = '# a note after the header';
    const bytes = encode(lines.join('\n'));
    const split = splitTrace(bytes, { minBytes: 0 })!;
    const line = (at: number) => new TextDecoder().decode(bytes.subarray(0, at)).split('\n').length;
    expect(line(split.at)).toBeGreaterThan(mid + 1);
    const one = await fault(readTraceBytes(bytes, options));
    expect(one).toMatch(new RegExp(`^run\\.csv line ${mid + 1}: `));
    expect(await fault(readTraceHead(bytes, split, options))).toBe(one);
  });

  it('no split in a comment block longer than the search, before a header far in, or in a small file', () => {
    const rows = traceText(10_000).split('\n');
    const block = [...rows.slice(0, 2 + 5_000), ...Array(200).fill('#'), ...rows.slice(2 + 5_000)].join('\n');
    const b = encode(block);
    // the block's middle holds the search's start only if it is there: put the start inside it
    const blockStart = encode([...rows.slice(0, 2 + 5_000)].join('\n')).length + 1;
    expect(splitTrace(b, { minBytes: 0, fraction: (blockStart + 10) / b.length })).toBeNull();
    const farHeader = encode('#\n'.repeat(40_000) + 'time_s,signal\n0,1\n1,1\n2,1\n');
    expect(splitTrace(farHeader, { minBytes: 0 })).toBeNull();
    expect(splitTrace(encode(traceText(10_000)))).toBeNull();
  });

  it('the parts are read in the chunks of a streamed read of the file (a line longer than the limit faults alike)', async () => {
    const long = 'x'.repeat(3 * STREAM_CHUNK);
    const lines = traceText(20_000).split('\n');
    lines[2 + 100] = `${lines[2 + 100]}${long}`;
    const bytes = encode(lines.join('\n'));
    const o = { ...options, maxLineLength: 2 * STREAM_CHUNK };
    const split = splitTrace(bytes, { minBytes: 0 })!;
    const one = await fault(readTraceBytes(bytes, o));
    expect(one).toMatch(/^run\.csv line 103: /);
    expect(await fault(readTraceHead(bytes, split, o))).toBe(one);
  });
});
