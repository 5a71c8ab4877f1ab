import { type ChamberRun } from './options';

/** The run as trace CSV (shared/FORMATS.md), in chunks: metadata, header, rows. */
export function* chamberCsvChunks(run: ChamberRun, rowsPerChunk = 20000): Generator<string> {
  const { layer: withLayer, chip: withChip, crystal: withCrystal, reference: withReference } = run.columns;
  // enough decimals that jittered time stamps stay strictly increasing once rounded
  let minStep = Infinity;
  for (let i = 1; i < run.timeS.length; i++) minStep = Math.min(minStep, run.timeS[i] - run.timeS[i - 1]);
  let timeDigits = 3;
  while (timeDigits < 9 && 10 ** -timeDigits > minStep / 4) timeDigits++;
  let head = '';
  for (const [k, v] of Object.entries(run.meta)) head += `# ${k}: ${v}\n`;
  head += ['time_s', 'signal', ...(withLayer ? ['layer'] : []), ...(withChip ? ['chip'] : []), ...(withCrystal ? ['crystal_nm'] : []), ...(withReference ? ['reference'] : [])].join(',') + '\n';
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
      if (withReference) text += `,${run.reference![i].toFixed(6)}`;
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
