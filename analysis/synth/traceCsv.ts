import { type SynthRun } from './types';

export interface CsvOptions {
  /** Data rows per chunk. @default 20000 */
  rowsPerChunk?: number;
}

/** The run as trace CSV (shared/FORMATS.md), in chunks of text: metadata, header, rows. */
export function* traceCsvChunks(run: SynthRun, options: CsvOptions = {}): Generator<string> {
  const rowsPerChunk = options.rowsPerChunk ?? 20000;
  const withLayer = run.options.layerColumn ?? true;
  const withChip = run.options.chipColumn ?? true;
  const withCrystal = run.crystalNm !== null;
  let head = '';
  for (const [k, v] of Object.entries(run.meta)) head += `# ${k}: ${v}\n`;
  head += ['time_s', 'signal', ...(withLayer ? ['layer'] : []), ...(withChip ? ['chip'] : []), ...(withCrystal ? ['crystal_nm'] : [])].join(',') + '\n';
  yield head;
  const n = run.timeS.length;
  for (let start = 0; start < n; start += rowsPerChunk) {
    const end = Math.min(n, start + rowsPerChunk);
    const lines: string[] = new Array(end - start);
    for (let i = start; i < end; i++) {
      let line = `${run.timeS[i].toFixed(3)},${run.signal[i].toFixed(6)}`;
      if (withLayer) line += `,${run.layer[i]}`;
      if (withChip) line += `,${run.chip[i]}`;
      if (withCrystal) line += `,${run.crystalNm![i].toFixed(2)}`;
      lines[i - start] = line;
    }
    yield lines.join('\n') + '\n';
  }
}

/** The whole run as one CSV string (for small traces). */
export function traceCsv(run: SynthRun): string {
  return Array.from(traceCsvChunks(run)).join('');
}
