import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { formFromHeader, readTraceHeader } from '../traceHeader';

const sample = fs.readFileSync(path.resolve(import.meta.dirname, '../../../sample-traces/bay1-ar1-run0412.csv'), 'utf8');

describe('reading a trace header in the browser', () => {
  it('reads the metadata lines of a sample trace and stops at the column header', () => {
    const meta = readTraceHeader(sample.slice(0, 4096));
    expect(meta).toMatchObject({ chamber: 'Bay 1 e-beam', run: 'B1-0412', operator: 'Ines Varga', shift: 'early', date: '2026-11-03', monitor_wavelength_nm: '550' });
    expect(Object.keys(meta)).not.toContain('time_s,signal,layer,chip');
  });

  it('ignores lines without a colon, a BOM and CRLF, and anything after the header', () => {
    expect(readTraceHeader('\uFEFF# run: A-1\r\n# no colon here\r\n\r\n# shift :  late \r\ntime_s,signal\r\n# run: B-2\r\n')).toEqual({ run: 'A-1', shift: 'late' });
  });

  it('fills the form: a known design at its newest revision, a known chamber, the date as a day', () => {
    const designs = [
      { name: 'AR', revision: 1 },
      { name: 'AR', revision: 3 },
      { name: 'HR', revision: 1 },
    ];
    expect(formFromHeader({ design: 'AR', chamber: 'Bay 2', run: 'X', date: '2026-11-03T06:10:00Z' }, designs, ['Bay 2'])).toEqual({
      design: 'AR',
      designRevision: '3',
      chamber: 'Bay 2',
      runCode: 'X',
      shift: '',
      operator: '',
      startedAt: '2026-11-03',
    });
    expect(formFromHeader({ design: 'Unknown', chamber: 'Bay 9' }, designs, ['Bay 2'])).toMatchObject({ design: '', designRevision: '', chamber: '' });
  });
});
