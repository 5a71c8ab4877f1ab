import { describe, expect, it } from 'vitest';
import { readTrace, readTraceRows, readTraceText } from '../readTrace';
import { TraceFormatError } from '../TraceFormatError';

const opts = { fileName: 'trace.csv' };

async function fault(text: string, options: Parameters<typeof readTraceText>[1] = opts): Promise<TraceFormatError> {
  try {
    await readTraceText(text, options);
  } catch (e) {
    if (e instanceof TraceFormatError) return e;
    throw e;
  }
  throw new Error('expected a TraceFormatError');
}

function rows(count: number, layer: (i: number) => number = (i) => (i < 5 ? 0 : 1)): string {
  let s = '';
  for (let i = 0; i < count; i++) s += `${(i * 0.1).toFixed(1)},${(0.9 + 0.01 * Math.sin(i / 7)).toFixed(6)},${layer(i)}\n`;
  return s;
}

describe('readTrace: the format of shared/FORMATS.md', () => {
  it('reads metadata, header and typed columns', async () => {
    const t = await readTraceText('# chamber: Bay 1 e-beam\n# monitor_wavelength_nm: 550\ntime_s,signal,layer\n0.000,0.918211,0\n0.100,0.918502,0\n0.200,0.9172,1\n', opts);
    expect(t.meta).toEqual({ chamber: 'Bay 1 e-beam', monitor_wavelength_nm: '550' });
    expect(t.columns).toEqual(['time_s', 'signal', 'layer']);
    expect(t.rowCount).toBe(3);
    expect(Array.from(t.timeS)).toEqual([0, 0.1, 0.2]);
    expect(Array.from(t.signal)).toEqual([0.918211, 0.918502, 0.9172]);
    expect(Array.from(t.layer!)).toEqual([0, 0, 1]);
    expect(t.layer).toBeInstanceOf(Int32Array);
    expect(t.chip).toBeNull();
    expect(t.crystalNm).toBeNull();
    expect(t.headerLine).toBe(3);
  });

  it('takes columns in any order, tab separated, with CRLF, a BOM and trailing blank lines', async () => {
    const text = '\uFEFF# operator: R. Okafor\r\ncrystal_nm\tchip\tsignal\ttime_s\tlayer\r\n0\t1\t0.5\t10\t0\r\n1.5\t1\t0.6\t10.5\t1\r\n\r\n\r\n';
    const t = await readTraceText(text, opts);
    expect(t.meta).toEqual({ operator: 'R. Okafor' });
    expect(t.separator).toBe('\t');
    expect(Array.from(t.timeS)).toEqual([10, 10.5]);
    expect(Array.from(t.signal)).toEqual([0.5, 0.6]);
    expect(Array.from(t.chip!)).toEqual([1, 1]);
    expect(Array.from(t.crystalNm!)).toEqual([0, 1.5]);
    expect(Array.from(t.layer!)).toEqual([0, 1]);
  });

  it('ignores an unknown column with a warning and accepts a file without a final newline', async () => {
    const t = await readTraceText('time_s,shutter,signal\n0,open,1\n1,open,2', opts);
    expect(Array.from(t.signal)).toEqual([1, 2]);
    expect(t.layer).toBeNull();
    expect(t.warnings.map((w) => w.message)).toContain('line 1: unknown column "shutter" ignored');
  });

  it('streams: lines split across chunks, a UTF-8 character split across byte chunks', async () => {
    const text = `# chamber: Bay 2 IAD — Süd\ntime_s,signal,layer\n${rows(300)}`;
    const bytes = new TextEncoder().encode(text);
    const dash = bytes.indexOf(0xe2); // first byte of "—", a three-byte character
    const cuts = [1, dash + 1, dash + 2, 50, 51, 97, 200, 1001, 2500, bytes.length];
    async function* chunks() {
      let from = 0;
      for (const to of cuts) {
        yield bytes.subarray(from, to);
        from = to;
      }
    }
    const streamed = await readTrace(chunks(), opts);
    const whole = await readTraceText(text, opts);
    expect(streamed.meta.chamber).toBe('Bay 2 IAD — Süd');
    expect(streamed.rowCount).toBe(300);
    expect(Array.from(streamed.signal)).toEqual(Array.from(whole.signal));
    expect(Array.from(streamed.timeS)).toEqual(Array.from(whole.timeS));
  });

  it('reads string chunks split mid-line', async () => {
    const text = `time_s,signal\n${Array.from({ length: 50 }, (_, i) => `${i},${i * 2}`).join('\n')}\n`;
    async function* chunks() {
      for (let i = 0; i < text.length; i += 7) yield text.slice(i, i + 7);
    }
    const t = await readTrace(chunks());
    expect(t.rowCount).toBe(50);
    expect(t.signal[49]).toBe(98);
  });
});

describe('readTrace: faults name the file, line and column', () => {
  const cases: [string, string, string, string?][] = [
    ['time_s,signal\n0,1\n1,abc\n', 'trace.csv line 3, column "signal": "abc" is not a number', 'not_a_number', 'signal'],
    ['time_s,signal\n0,1\n1,NaN\n', 'trace.csv line 3, column "signal": "NaN" is not a finite number', 'not_finite', 'signal'],
    ['time_s,signal\n0,1\nInfinity,2\n', 'trace.csv line 3, column "time_s": "Infinity" is not a finite number', 'not_finite', 'time_s'],
    ['time_s,signal\n0,1\n1,\n', 'trace.csv line 3, column "signal": empty value where a number is needed', 'not_a_number', 'signal'],
    ['time_s,signal\n0,0x1A\n', 'trace.csv line 2, column "signal": "0x1A" is not a number', 'not_a_number', 'signal'],
    ['time_s,signal\n0,1\n0.5,1\n0.5,1\n', 'trace.csv line 4, column "time_s": 0.5 is not after the previous time 0.5 (line 3); time must be strictly increasing', 'time_not_increasing', 'time_s'],
    ['time_s,signal\n1,1\n0.9,1\n', 'trace.csv line 3, column "time_s": 0.9 is not after the previous time 1 (line 2); time must be strictly increasing', 'time_not_increasing', 'time_s'],
    ['time_s,signal,layer\n0,1,0\n1,1,1.5\n', 'trace.csv line 3, column "layer": "1.5" is not a layer number (a non-negative integer)', 'bad_layer', 'layer'],
    ['time_s,signal,layer\n0,1,-1\n', 'trace.csv line 2, column "layer": "-1" is not a layer number (a non-negative integer)', 'bad_layer', 'layer'],
    ['time_s,signal,chip\n0,1,0\n', 'trace.csv line 2, column "chip": "0" is not a chip number (a positive integer)', 'bad_chip', 'chip'],
    ['time_s,signal\n0,1\n1,2,3\n', 'trace.csv line 3: expected 2 fields (time_s, signal), found 3', 'field_count'],
    ['time_s,signal,layer\n0,1\n', 'trace.csv line 2: expected 3 fields (time_s, signal, layer), found 2', 'field_count'],
    ['time_s,signal,\n0,1,\n', 'trace.csv line 1: header field 3 is empty', 'empty_column_name'],
    ['time_s,signal,time_s\n0,1,2\n', 'trace.csv line 1, column "time_s": the column is named twice in the header', 'duplicate_column', 'time_s'],
    ['# chamber: Bay 1\ntime_s,layer\n0,1\n', 'trace.csv line 2: the header has no "signal" column (required: time_s, signal)', 'missing_column'],
    ['0.0,0.9,0\n0.1,0.9,0\n', 'trace.csv line 1: expected a header row naming the columns (time_s, signal, …) before the data, found "0.0,0.9,0"', 'no_header'],
    ['', 'trace.csv line 1: the file is empty', 'empty_file'],
    ['\n\r\n  \n', 'trace.csv line 1: the file is empty', 'empty_file'],
    ['# chamber: Bay 1\n# shift: B\n', 'trace.csv line 2: no header row (expected one naming at least time_s and signal)', 'no_header'],
    ['time_s,signal\n', 'trace.csv line 1: the header is not followed by any data rows', 'no_data'],
    ['time_s,signal\n0,1\n# note: late\n1,2\n', 'trace.csv line 3: a "#" metadata line after the header (metadata may only precede it)', 'metadata_after_header'],
    ['time_s,signal\n0,1\n\n1,2\n', 'trace.csv line 3: blank line inside the data (only trailing blank lines are allowed)', 'blank_line'],
  ];
  for (const [text, message, code, column] of cases) {
    it(code + ': ' + message.slice(10, 60), async () => {
      const e = await fault(text);
      expect(e.message).toBe(message);
      expect(e.code).toBe(code);
      expect(e.column).toBe(column);
      expect(e.fileName).toBe('trace.csv');
      expect(e.line).toBe(Number(/line (\d+)/.exec(message)![1]));
    });
  }

  it('rejects a layer the design does not have', async () => {
    const e = await fault('time_s,signal,layer\n0,1,0\n1,1,3\n2,1,5\n', { fileName: 'run7.csv', layerCount: 4 });
    expect(e.message).toBe('run7.csv line 4, column "layer": layer 5 is beyond the design\'s 4 layers');
  });

  it('omits the file name when none is given', async () => {
    const e = await fault('time_s,signal\n0,x\n', {});
    expect(e.message).toBe('line 2, column "signal": "x" is not a number');
  });

  it('stops at the row limit and at the size limit, naming the limit', async () => {
    const e = await fault('time_s,signal\n0,1\n1,1\n2,1\n3,1\n', { fileName: 'trace.csv', maxRows: 2 });
    expect(e.message).toBe('trace.csv line 4: more than 2 data rows (the row limit is 2)');
    const big = await fault(`time_s,signal\n${rows(2000)}`, { fileName: 'trace.csv', maxBytes: 1024 });
    expect(big.code).toBe('size_limit');
    expect(big.message).toBe('trace.csv line 1: the file is larger than the size limit of 1024 bytes');
  });

  it('reports the default size limit in MiB, before decoding the chunk that passes it', async () => {
    async function* huge() {
      yield new TextEncoder().encode('time_s,signal\n0,1\n');
      yield new Uint8Array(200 * 1024 * 1024); // zero-filled, never touched unless decoded
    }
    await expect(readTrace(huge())).rejects.toThrow('line 3: the file is larger than the size limit of 200 MiB (209715200 bytes)');
  });

  it('rejects invalid UTF-8', async () => {
    const bytes = new Uint8Array([...new TextEncoder().encode('time_s,signal\n0,1\n1,'), 0xff, 0x0a]);
    await expect(readTrace([bytes], opts)).rejects.toThrow('trace.csv line 3: the text is not valid UTF-8');
  });

  it('bytes: the first fault by line, a bad value before bad UTF-8 in the same chunk', async () => {
    const bytes = new Uint8Array([...new TextEncoder().encode('time_s,signal\n0,1\n1,x\n2,'), 0xff, 0x0a]);
    await expect(readTrace([bytes], opts)).rejects.toThrow('trace.csv line 3, column "signal": "x" is not a number');
  });

  it('bytes: time going back names the previous time as written, though its chunk was reused', async () => {
    // a producer that refills one buffer for every chunk (the reader must not keep views of it)
    const text = new TextEncoder().encode('time_s,signal\n0.25,1\n0.125,1\n');
    const cut = text.indexOf(0x0a, 14) + 1;
    async function* reused() {
      const buf = new Uint8Array(64);
      for (const part of [text.subarray(0, cut), text.subarray(cut)]) {
        buf.fill(0x39);
        buf.set(part);
        yield buf.subarray(0, part.length);
      }
    }
    await expect(readTrace(reused(), opts)).rejects.toThrow('trace.csv line 3, column "time_s": 0.125 is not after the previous time 0.25 (line 2); time must be strictly increasing');
  });

  it('bytes and text read alike: a BOM, metadata beyond ASCII, CRLF, a row split across chunks', async () => {
    const text = '\uFEFF# chamber: Bay 1 — µ\r\ntime_s\tsignal\tnote\r\n0.5\t0.25\tok\r\n1.5\t1e-3\tµ\r\n2.5\t-0.75\t\r\n';
    const bytes = new TextEncoder().encode(text);
    const chunks = [bytes.subarray(0, 2), bytes.subarray(2, 61), bytes.subarray(61, 70), bytes.subarray(70)];
    const [a, b] = [await readTrace(chunks, opts), await readTraceText(text, opts)];
    expect(a.meta).toEqual({ chamber: 'Bay 1 — µ' });
    expect(Array.from(a.timeS)).toEqual([0.5, 1.5, 2.5]);
    expect(Array.from(a.signal)).toEqual([0.25, 0.001, -0.75]);
    expect({ ...a, timeS: 0, signal: 0 }).toEqual({ ...b, timeS: 0, signal: 0 });
  });
});

describe('readTrace: warnings', () => {
  it('a layer with too few samples', async () => {
    const t = await readTraceText(`time_s,signal,layer\n${rows(40, (i) => (i < 25 ? 1 : 2))}`, opts);
    expect(t.warnings).toEqual([
      { code: 'few_samples', layer: 2, message: 'layer 2 has only 15 samples (at least 20 are needed for a reliable fit)' },
    ]);
  });

  it('a gap in time, on the line after it', async () => {
    const lines = Array.from({ length: 40 }, (_, i) => `${(i < 30 ? i * 0.1 : i * 0.1 + 2).toFixed(1)},${0.5 + 0.001 * (i % 3)}`);
    const t = await readTraceText(`# a: b\ntime_s,signal\n${lines.join('\n')}\n`, opts);
    expect(t.warnings).toEqual([
      { code: 'time_gap', line: 33, message: 'line 33: a gap of 2.1 s in time_s after 2.9 s (the median step is 0.1 s)' },
    ]);
  });

  it('a saturated (clipped) signal at its maximum', async () => {
    const values = Array.from({ length: 60 }, (_, i) => Math.min(4.5, 4 + Math.sin(i / 5)).toFixed(4));
    const t = await readTraceText(`time_s,signal\n${values.map((v, i) => `${i},${v}`).join('\n')}`, opts);
    const sat = t.warnings.filter((w) => w.code === 'saturated_max');
    expect(sat).toHaveLength(1);
    expect(sat[0].message).toMatch(/^signal sits at its maximum 4.5 in 2 runs of 5 or more identical samples \(\d+ samples, the first at line \d+\)/);
    expect(t.warnings.some((w) => w.code === 'saturated_min')).toBe(false);
  });

  it('no warnings on a clean trace', async () => {
    const t = await readTraceText(`time_s,signal,layer\n${rows(100)}`, opts);
    expect(t.warnings).toEqual([]);
  });
});

describe('readTraceRows with shared columns (for a second thread)', () => {
  it("reads every row, past the columns' growth, into SharedArrayBuffers, as many values as rows", async () => {
    const text = rows(3000, (i) => 1 + Math.floor(i / 1000));
    const t = await readTraceRows(['time_s,signal,layer\n', text], opts, true);
    const lines = text.trim().split('\n').map((l) => l.split(','));
    expect(t.rowCount).toBe(3000);
    for (const [column, j] of [[t.timeS, 0], [t.signal, 1], [t.layer!, 2]] as const) {
      expect(column.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(Array.from(column)).toEqual(lines.map((l) => Number(l[j])));
    }
  });
});
