import { describe, expect, it } from 'vitest';
import { readTrace, readTraceText, scanTrace } from '../readTrace';
import { TraceFormatError } from '../TraceFormatError';

// The optional `reference` column (a dual-beam monitor's reading of the lamp): read into its own
// Float64Array only where the header names it, checked as finite and > 0 row by row.
const opts = { fileName: 'trace.csv' };

async function fault(read: () => Promise<unknown>): Promise<TraceFormatError> {
  try {
    await read();
  } catch (e) {
    if (e instanceof TraceFormatError) return e;
    throw e;
  }
  throw new Error('expected a TraceFormatError');
}

/** n rows of time_s,signal,reference,layer, the reference of row `bad` replaced by `value`. */
function rows(n: number, bad = -1, value = ''): string {
  let s = 'time_s,signal,reference,layer\n';
  for (let i = 0; i < n; i++) s += `${(i * 0.1).toFixed(1)},${(0.9 + 0.01 * Math.sin(i / 7)).toFixed(6)},${i === bad ? value : (0.8 - 1e-6 * i).toFixed(6)},${i < 5 ? 0 : 1}\n`;
  return s;
}

const bytes = (text: string) => [new TextEncoder().encode(text)];

describe('readTrace: the reference column', () => {
  it('reads it as a Float64Array beside the signal, as text and as bytes, with no warning', async () => {
    const text = rows(3000);
    for (const t of [await readTraceText(text, opts), await readTrace(bytes(text), opts)]) {
      expect(t.columns).toEqual(['time_s', 'signal', 'reference', 'layer']);
      expect(t.reference).toBeInstanceOf(Float64Array);
      expect(t.reference!.length).toBe(3000);
      expect(t.reference![0]).toBe(0.8);
      expect(t.reference![2999]).toBe(0.797001);
      expect(t.signal[1]).toBe(0.901424);
      expect(t.warnings.filter((w) => w.code === 'unknown_column')).toEqual([]);
    }
  });

  it('keeps no array for it where the file has none, and other unknown columns are still ignored with a warning', async () => {
    const t = await readTraceText('time_s,signal,ref_detector\n0,1,5\n1,2,5\n', opts);
    expect(t.reference).toBeUndefined();
    expect('reference' in t).toBe(false);
    expect(t.warnings.map((w) => w.message)).toContain('line 1: unknown column "ref_detector" ignored');
  });

  it.each([
    ['0', 'bad_reference', '"0" is not a lamp reference reading (a positive number)'],
    ['-0.5', 'bad_reference', '"-0.5" is not a lamp reference reading (a positive number)'],
    ['lamp', 'not_a_number', '"lamp" is not a number'],
    ['inf', 'not_a_number', '"inf" is not a number'],
    ['Infinity', 'not_finite', '"Infinity" is not a finite number'],
    ['', 'not_a_number', 'empty value where a number is needed'],
  ])('refuses a reference of "%s", naming line and column', async (value, code, detail) => {
    // row 2000 sits on line 2002 (the header is line 1); as text, as bytes and when only scanned
    const text = rows(2500, 2000, value);
    for (const read of [() => readTraceText(text, opts), () => readTrace(bytes(text), opts), () => scanTrace(bytes(text), opts)]) {
      const e = await fault(read);
      expect(e.code).toBe(code);
      expect(e.line).toBe(2002);
      expect(e.column).toBe('reference');
      expect(e.columnNumber).toBe(3);
      expect(e.message).toBe(`trace.csv line 2002, column "reference": ${detail}`);
    }
  });
});
