import { TraceParser } from './traceParser';

/**
 * A stretch of a trace's bytes read apart from the rest (the analyze command reads the end of a
 * large file on its second thread while the main one reads the start): every line an ordinary
 * data row as TraceParser.rowsBytes reads it, each row's time after the one before. The reader
 * of the whole file (readTrace) appends it only where rowsBytes would have read the same rows the
 * same way at that point (TraceParser.appendRows); anywhere else it reads the stretch's bytes.
 */
export interface RowsBlock {
  /** The header and separator the rows were read under. */
  columns: string[];
  separator: ',' | '\t';
  rows: number;
  /** The first row's time, s (NaN without rows). */
  firstTimeS: number;
  /** The last row's time, s, and its field as written (for the message when the next time goes backwards). */
  lastTimeS: number;
  lastTimeText: string;
  /** Highest layer number among the rows (0 without a layer column). */
  maxLayer: number;
  /** One array per header field (null: an ignored column), rows long. */
  fields: (Float64Array | Int32Array | null)[];
}

/** A stretch of a file's bytes, whole lines, as its rows read apart (null: not read so) and its bytes on demand; readTrace takes it between byte chunks. */
export interface RowsBlockChunk {
  block: RowsBlock | null;
  byteLength: number;
  bytes: () => Uint8Array;
}

/** The first line of bytes (the start of a trace file) that is neither blank nor a '#' metadata line, as text; null when there is none, or the text is not valid UTF-8. */
export function headerLineOf(bytes: Uint8Array): string | null {
  // whole lines only (a line feed never occurs inside a UTF-8 sequence), decoded at once: a
  // file that opens with a million comment lines costs one decode, not one a line
  const last = bytes.lastIndexOf(10);
  if (last < 0) return null;
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes.subarray(0, last + 1));
  } catch {
    return null;
  }
  for (let start = 0; start < text.length; ) {
    const nl = text.indexOf('\n', start);
    const end = nl > start && text.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
    if (text.charCodeAt(start) !== 35) {
      const line = text.substring(start, end);
      if (line.trim().length > 0) return line;
    }
    start = nl + 1;
  }
  return null;
}

/**
 * The rows of bytes (whole lines; at the file's end, atEnd, the last may lack its line end)
 * under the header line `header`; null when any line is not an ordinary data row (the caller
 * then reads the bytes as text is read, which names the fault or reads the line otherwise).
 */
export function readRowsBlock(header: string, bytes: Uint8Array, atEnd: boolean, layerCount?: number): RowsBlock | null {
  const parser = new TraceParser({ maxRows: Infinity, layerCount, keepSamples: true });
  try {
    parser.line(header, 1);
  } catch {
    return null;
  }
  let stop = parser.rowsBytes(bytes, 0, bytes.length);
  if (stop < bytes.length) {
    if (!atEnd || bytes.indexOf(10, stop) >= 0 || !parser.rowBytes(bytes, stop, bytes.length)) return null;
    stop = bytes.length;
  }
  const n = parser.rowCount;
  const byColumn = new Map<unknown, Float64Array | Int32Array | null>([
    [parser.time, TraceParser.samples(parser.time, n)],
    [parser.signal, TraceParser.samples(parser.signal, n)],
    [parser.layer, parser.layer ? TraceParser.samples(parser.layer, n) : null],
    [parser.chip, parser.chip ? TraceParser.samples(parser.chip, n) : null],
    [parser.crystal, parser.crystal ? TraceParser.samples(parser.crystal, n) : null],
    [parser.reference, parser.reference ? TraceParser.samples(parser.reference, n) : null],
  ]);
  const time = byColumn.get(parser.time) as Float64Array;
  return {
    columns: parser.columns,
    separator: parser.separator,
    rows: n,
    firstTimeS: n > 0 ? time[0] : NaN,
    lastTimeS: n > 0 ? time[n - 1] : NaN,
    lastTimeText: n > 0 ? parser.previousTimeText() : '',
    maxLayer: parser.maxLayer,
    fields: parser.fieldColumnsOf((c) => byColumn.get(c) ?? null),
  };
}

/** The buffers of a block's arrays, to hand them to another thread without copying. */
export function rowsBlockBuffers(b: RowsBlock): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  for (const f of b.fields) if (f) out.add(f.buffer as ArrayBuffer);
  return [...out];
}
