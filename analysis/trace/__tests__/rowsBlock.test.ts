import { describe, expect, it } from 'vitest';
import { readTrace } from '../readTrace';
import { headerLineOf, readRowsBlock, type RowsBlockChunk } from '../rowsBlock';
import { TraceFormatError } from '../TraceFormatError';
import type { ReadTraceOptions, TraceData } from '../types';

// A trace read in one piece against the same bytes read with stretches of it read apart
// (RowsBlock), as the analyze command's two threads read a large file: the same samples, warnings,
// line numbers, and the same first fault at the same line and column.

const enc = new TextEncoder();
const opts: ReadTraceOptions = { fileName: 'trace.csv', layerCount: 3 };

function rows(from: number, count: number, eol = '\n'): string {
  let s = '';
  for (let i = from; i < from + count; i++) {
    s += `${(i * 0.1).toFixed(1)},${(0.9 + 0.01 * Math.sin(i / 7)).toFixed(6)},${i < 40 ? 0 : i < 120 ? 1 : 2},${i % 2 ? 1 : 2}${eol}`;
  }
  return s;
}

const HEAD = '# chamber: Bay 1\ntime_s,signal,layer,chip\n';

/** The start of the line that holds byte x (the first line start at or after it). */
function lineStart(bytes: Uint8Array, x: number): number {
  if (x <= 0) return 0;
  const nl = bytes.indexOf(10, x - 1);
  return nl < 0 ? bytes.length : nl + 1;
}

/** The bytes as readTrace gets them from the command: raw up to `cuts[0]`, then each stretch read apart (lines starting from each cut to the next). */
function splitChunks(bytes: Uint8Array, cuts: number[], layerCount = opts.layerCount, counts = { fromBytes: 0 }): (Uint8Array | RowsBlockChunk)[] {
  const header = headerLineOf(bytes.subarray(0, cuts[0]));
  const starts = cuts.map((c) => lineStart(bytes, c));
  const out: (Uint8Array | RowsBlockChunk)[] = [bytes.subarray(0, starts[0])];
  starts.forEach((start, k) => {
    const end = k + 1 < starts.length ? starts[k + 1] : bytes.length;
    const own = bytes.subarray(start, end);
    out.push({ block: header === null ? null : readRowsBlock(header, own, end === bytes.length, layerCount), byteLength: own.length, bytes: () => (counts.fromBytes++, own.slice()) });
  });
  return out;
}

async function outcome(chunks: Iterable<Uint8Array | RowsBlockChunk>, options = opts): Promise<TraceData | TraceFormatError> {
  try {
    return await readTrace(chunks, options);
  } catch (e) {
    if (e instanceof TraceFormatError) return e;
    throw e;
  }
}

function summary(t: TraceData | TraceFormatError) {
  if (t instanceof TraceFormatError) return { fault: t.message };
  return {
    rows: t.rowCount, meta: t.meta, columns: t.columns, headerLine: t.headerLine, warnings: t.warnings,
    timeS: Array.from(t.timeS), signal: Array.from(t.signal), layer: Array.from(t.layer ?? []), chip: Array.from(t.chip ?? []),
  };
}

/** The outcome read whole, and how many stretches were read from their bytes (not appended). */
async function expectSame(text: string, cuts: number[], options = opts) {
  const bytes = enc.encode(text);
  const whole = summary(await outcome([bytes], options));
  const counts = { fromBytes: 0 };
  const split = summary(await outcome(splitChunks(bytes, cuts, options.layerCount, counts), options));
  expect(split).toEqual(whole);
  return { ...whole, fromBytes: counts.fromBytes };
}

describe('a trace read in stretches apart reads as it reads in one piece', () => {
  it('the same samples, metadata, header line and warnings, the stretches cut mid-line', async () => {
    const text = HEAD + rows(0, 300);
    const at = (row: number) => enc.encode(HEAD + rows(0, row)).length;
    const whole = await expectSame(text, [at(50) + 5, at(170) + 3, at(290) - 2]);
    expect(whole.rows).toBe(300);
    expect(whole.fromBytes).toBe(0);
    // the block reader did read the stretches (they are not all read from their bytes)
    const bytes = enc.encode(text);
    const block = readRowsBlock(headerLineOf(bytes)!, bytes.subarray(at(50), at(170)), false, 3);
    expect(block?.rows).toBe(120);
    expect(block?.firstTimeS).toBe(5);
    expect(block?.lastTimeText).toBe('16.9');
  });

  it('CRLF lines, a tab-separated header, a last line without its end', async () => {
    const text = 'time_s\tsignal\tlayer\tchip\r\n' + rows(0, 200, '\r\n').replaceAll(',', '\t').replace(/\r\n$/, '');
    const whole = await expectSame(text, [900, 2500]);
    expect(whole.rows).toBe(200);
    expect(whole.fromBytes).toBe(0);
  });

  it('time not increasing at the first row of a stretch: the same fault, naming the previous time and line', async () => {
    // row 100's time is 9.9, row 99's is 9.9 too
    const text = HEAD + rows(0, 100) + rows(99, 100);
    const cut = enc.encode(HEAD + rows(0, 100)).length;
    const whole = await expectSame(text, [cut]);
    expect(whole.fault).toBe('trace.csv line 103, column "time_s": 9.9 is not after the previous time 9.9 (line 102); time must be strictly increasing');
    expect(whole.fromBytes).toBe(1);
  });

  it('a bad value, a comment line, a layer out of range inside a stretch', async () => {
    const base = rows(0, 200).split('\n');
    const cut = enc.encode(HEAD + base.slice(0, 80).join('\n') + '\n').length;
    for (const [row, line] of [[130, '13.0,abc,2,1'], [131, '# a note'], [132, '13.2,0.9,4,1']] as const) {
      const bad = [...base];
      bad[row] = line;
      const whole = await expectSame(HEAD + bad.join('\n'), [cut]);
      expect(whole.fault).toMatch(new RegExp(`^trace.csv line ${row + 3}`));
    }
  });

  it('a blank line just before a stretch, and trailing blank lines in the last', async () => {
    const first = HEAD + rows(0, 100);
    const blank = await expectSame(first + '\n' + rows(100, 100), [enc.encode(first + '\n').length]);
    expect(blank.fault).toBe('trace.csv line 103: blank line inside the data (only trailing blank lines are allowed)');
    const trailing = await expectSame(HEAD + rows(0, 200) + '\n\n', [enc.encode(first).length]);
    expect(trailing.rows).toBe(200);
    expect(blank.fromBytes).toBe(1);
    expect(trailing.fromBytes).toBe(1);
  });

  it('the row limit crossed inside a stretch', async () => {
    const text = HEAD + rows(0, 200);
    const whole = await expectSame(text, [enc.encode(HEAD + rows(0, 100)).length], { ...opts, maxRows: 150 });
    expect(whole.fault).toMatch(/^trace.csv line 153: more than 150 data rows/);
  });

  it('warnings counted past the listed ones, from lines before a stretch and the trace after it', async () => {
    const meta = Array.from({ length: 30 }, (_, i) => `# note ${i}\n`).join('');
    const text = meta + 'time_s,signal,layer,chip,shutter\n' + rows(0, 150).replaceAll('\n', ',open\n');
    const whole = await expectSame(text, [enc.encode(text).length >> 1]);
    expect(whole.warnings?.some((w) => w.code === 'metadata_malformed_more')).toBe(true);
    expect(whole.fromBytes).toBe(0);
  });

  it('no header in the bytes before the first stretch: read from the bytes', async () => {
    const text = Array.from({ length: 60 }, () => '# x\n').join('') + 'time_s,signal,layer,chip\n' + rows(0, 50);
    const whole = await expectSame(text, [100]);
    expect(whole.rows).toBe(50);
  });
});

describe('a lamp reference column read in stretches apart', () => {
  it('gives the same reference readings, each stretch appended, not read again from its bytes', async () => {
    const head = 'time_s,signal,layer,chip,reference\n';
    let text = head;
    for (let i = 0; i < 300; i++) text += `${(i * 0.1).toFixed(1)},${(0.9 + 0.01 * Math.sin(i / 7)).toFixed(6)},${i < 40 ? 0 : i < 120 ? 1 : 2},1,${(0.8 - 1e-5 * i).toFixed(6)}\n`;
    const bytes = enc.encode(text);
    const whole = await outcome([bytes]);
    const counts = { fromBytes: 0 };
    const split = await outcome(splitChunks(bytes, [bytes.length / 4, bytes.length / 2, (3 * bytes.length) / 4].map(Math.floor), opts.layerCount, counts));
    if (whole instanceof TraceFormatError || split instanceof TraceFormatError) throw new Error('expected both to read');
    expect(Array.from(split.reference!)).toEqual(Array.from(whole.reference!));
    expect(split.reference![299]).toBeCloseTo(0.8 - 1e-5 * 299, 9);
    expect(summary(split)).toEqual(summary(whole));
    expect(counts.fromBytes).toBe(0);
  });
});
