import { describe, expect, it } from 'vitest';
import { MAX_LISTED_WARNINGS, readTrace, readTraceText } from '..';

const rows = Array.from({ length: 50 }, (_, i) => `${(i * 0.1).toFixed(1)},0.9`).join('\n');

describe('trace warnings are capped: some listed, then a count', () => {
  it('two million bare "#" lines give 20 warnings and one count, not two million messages', async () => {
    function* chunks() {
      const block = '#\n'.repeat(100_000);
      for (let i = 0; i < 20; i++) yield block;
      yield `time_s,signal\n${rows}\n`;
    }
    const trace = await readTrace(chunks(), { fileName: 'hashes.csv' });
    const malformed = trace.warnings.filter((w) => w.code === 'metadata_malformed');
    expect(malformed).toHaveLength(MAX_LISTED_WARNINGS);
    expect(malformed[0].message).toBe('line 1: metadata line is not "# key: value"; ignored');
    expect(trace.warnings.find((w) => w.code === 'metadata_malformed_more')?.message).toBe(
      '1999980 more "metadata_malformed" warnings not listed (2000000 in all, the first at line 1)',
    );
    expect(trace.rowCount).toBe(50);
  });

  it('repeated metadata keys: the first 20 listed, the rest counted, the last value kept', async () => {
    const head = Array.from({ length: 31 }, (_, i) => `# chamber: Bay ${i}`).join('\n');
    const trace = await readTraceText(`${head}\ntime_s,signal\n${rows}\n`);
    expect(trace.warnings.filter((w) => w.code === 'metadata_duplicate')).toHaveLength(20);
    expect(trace.warnings.find((w) => w.code === 'metadata_duplicate_more')?.message).toBe('10 more "metadata_duplicate" warnings not listed (30 in all, the first at line 2)');
    expect(trace.meta.chamber).toBe('Bay 30');
  });

  it('layers with too few samples: 20 listed, then a count', async () => {
    const body = Array.from({ length: 60 }, (_, i) => `${(i * 0.1).toFixed(1)},0.9,${i + 1}`).join('\n');
    const trace = await readTraceText(`time_s,signal,layer\n${body}\n`);
    const few = trace.warnings.filter((w) => w.code === 'few_samples');
    expect(few.map((w) => w.layer)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(trace.warnings.find((w) => w.code === 'few_samples_more')?.message).toBe('40 more layers with fewer than 20 samples not listed (60 in all)');
  });
});
