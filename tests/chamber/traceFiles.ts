import { type ChamberRun } from './options';

/** The run as trace CSV (shared/FORMATS.md), in chunks: metadata, header, rows. */
export function* chamberCsvChunks(run: ChamberRun, rowsPerChunk = 20000): Generator<string> {
  const { layer: withLayer, chip: withChip, crystal: withCrystal } = run.columns;
  const timeDigits = run.sampleIntervalS < 0.01 ? 4 : 3;
  let head = '';
  for (const [k, v] of Object.entries(run.meta)) head += `# ${k}: ${v}\n`;
  head += ['time_s', 'signal', ...(withLayer ? ['layer'] : []), ...(withChip ? ['chip'] : []), ...(withCrystal ? ['crystal_nm'] : [])].join(',') + '\n';
  yield head;
  const n = run.timeS.length;
  for (let start = 0; start < n; start += rowsPerChunk) {
    const end = Math.min(n, start + rowsPerChunk);
    let text = '';
    for (let i = start; i < end; i++) {
      text += `${run.timeS[i].toFixed(timeDigits)},${run.signal[i].toFixed(6)}`;
      if (withLayer) text += `,${run.layer[i]}`;
      if (withChip) text += `,${run.chip[i]}`;
      if (withCrystal) text += `,${run.crystalNm![i].toFixed(2)}`;
      text += '\n';
    }
    yield text;
  }
}

export function chamberCsv(run: ChamberRun): string {
  return Array.from(chamberCsvChunks(run)).join('');
}

/** The truth file beside a trace: per layer and per chip, plus whatever the caller adds. */
export function chamberTruthJson(run: ChamberRun, extra: Record<string, unknown> = {}): string {
  return `${JSON.stringify({ ...extra, layers: run.truth.layers, chips: run.truth.chips }, null, 2)}\n`;
}
