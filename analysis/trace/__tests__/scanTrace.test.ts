import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readTraceText, scanTrace, TraceFormatError } from '..';

const samples = path.resolve(import.meta.dirname, '../../../sample-traces');

describe('scanTrace (checks without keeping samples)', () => {
  it('reads the metadata, columns, row count and highest layer of a sample trace', async () => {
    const text = fs.readFileSync(path.join(samples, 'bay2-bb4-run0587.csv'), 'utf8');
    const scan = await scanTrace([text], { fileName: 'bay2-bb4-run0587.csv' });
    const dataRows = text.split('\n').filter((l) => /^\d/.test(l));
    expect(scan.rowCount).toBe(dataRows.length);
    expect(scan.maxLayer).toBe(Math.max(...dataRows.map((l) => Number(l.split(',')[2]))));
    expect(scan.meta.chamber).toBe('Bay 2 IAD');
    expect(scan.columns.slice(0, 2)).toEqual(['time_s', 'signal']);
  });

  it('refuses every fault readTrace refuses, with the same line, column and message', async () => {
    const bad = [
      'time_s,signal\n0,0.5\n0.1,abc\n',
      'time_s,signal\n0,0.5\n0,0.6\n',
      'time_s,signal,layer\n0,0.5,1\n0.1,0.5,-1\n',
      'time_s,signal\n0,0.5\n\n0.2,0.5\n',
      'time_s,signal\n0,0.5,7\n',
      '# a: b\n',
      'signal\n0.5\n',
    ];
    for (const text of bad) {
      const viaRead = await readTraceText(text, { fileName: 't.csv' }).catch((e: unknown) => e);
      const viaScan = await scanTrace([text], { fileName: 't.csv' }).catch((e: unknown) => e);
      expect(viaRead, text).toBeInstanceOf(TraceFormatError);
      expect(viaScan, text).toBeInstanceOf(TraceFormatError);
      const [r, s] = [viaRead as TraceFormatError, viaScan as TraceFormatError];
      expect([s.line, s.column, s.columnNumber, s.message], text).toEqual([r.line, r.column, r.columnNumber, r.message]);
    }
  });

  it('numbers the column of a fault from 1, as the header lists it', async () => {
    const err = (await scanTrace(['layer,time_s,signal\n1,0,0.5\n1,0.1,x\n']).catch((e: unknown) => e)) as TraceFormatError;
    expect([err.line, err.column, err.columnNumber]).toEqual([3, 'signal', 3]);
  });
});
