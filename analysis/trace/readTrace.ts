import type { RowsBlockChunk } from './rowsBlock';
import { TraceFormatError } from './TraceFormatError';
import { type SampleColumn } from './sampleColumn';
import { TraceParser } from './traceParser';
import { traceWarnings } from './traceWarnings';
import type { ReadTraceOptions, TraceData, TraceScan } from './types';

const MIB = 1024 * 1024;

function resolve(options: ReadTraceOptions) {
  return {
    fileName: options.fileName,
    maxBytes: options.maxBytes ?? 200 * MIB,
    maxRows: options.maxRows ?? 5_000_000,
    layerCount: options.layerCount,
    gapFactor: options.gapFactor ?? 5,
    minLayerSamples: options.minLayerSamples ?? 20,
    maxLineLength: options.maxLineLength ?? MIB,
    expectedBytes: options.expectedBytes,
  };
}

/**
 * Reads a trace CSV (shared/FORMATS.md) from a stream of chunks, decoding UTF-8 incrementally
 * and storing the columns in typed arrays, so a large file never becomes one string. Chunks
 * should be all bytes or all strings (a string chunk between byte chunks could split a
 * multi-byte character). Throws TraceFormatError naming the line and column of the first fault.
 * Between byte chunks may come stretches read apart (RowsBlockChunk, rowsBlock.ts): appended where
 * they read as their bytes would, else their bytes are read; the result is the same.
 */
export async function readTrace(
  chunks: Chunks,
  options: ReadTraceOptions = {},
): Promise<TraceData> {
  const data = await readTraceRows(chunks, options);
  data.warnings.push(...traceWarnings(data, sampleWarningOptions(options)));
  return data;
}

/**
 * readTrace without the warnings that read the samples (traceWarnings with sampleWarningOptions),
 * for a caller that makes them elsewhere; with `shared`, the columns on SharedArrayBuffers, to
 * hand to another thread without copying.
 */
export async function readTraceRows(chunks: Chunks, options: ReadTraceOptions = {}, shared = false): Promise<TraceData> {
  const parser = await parse(chunks, resolve(options), true, shared);
  const n = parser.rowCount;
  // shared: the columns were read into SharedArrayBuffers; their first n rows, in place
  const take = <T extends Float64Array | Int32Array>(c: SampleColumn<T>): T => (shared ? c.data.subarray(0, n) as T : TraceParser.samples(c, n));
  return {
    meta: parser.meta,
    columns: parser.columns,
    timeS: take(parser.time),
    signal: take(parser.signal),
    layer: parser.layer ? take(parser.layer) : null,
    chip: parser.chip ? take(parser.chip) : null,
    crystalNm: parser.crystal ? take(parser.crystal) : null,
    ...(parser.reference ? { reference: take(parser.reference) } : {}),
    rowCount: n,
    warnings: parser.warnings,
    separator: parser.separator,
    headerLine: parser.headerLine,
  };
}

/** The options of the warnings that read the samples (traceWarnings), as readTrace takes them. */
export function sampleWarningOptions(options: ReadTraceOptions): { gapFactor: number; minLayerSamples: number } {
  const o = resolve(options);
  return { gapFactor: o.gapFactor, minLayerSamples: o.minLayerSamples };
}

/**
 * Checks a trace as readTrace does, row by row, but keeps no samples: memory stays flat however
 * large the file (an upload is checked while it streams to storage). The warnings that need the
 * samples (gaps, short layers) are left to readTrace.
 */
export async function scanTrace(
  chunks: AsyncIterable<string | Uint8Array> | Iterable<string | Uint8Array>,
  options: ReadTraceOptions = {},
): Promise<TraceScan> {
  const parser = await parse(chunks, resolve(options), false);
  return {
    meta: parser.meta,
    columns: parser.columns,
    rowCount: parser.rowCount,
    maxLayer: parser.maxLayer,
    warnings: parser.warnings,
    headerLine: parser.headerLine,
  };
}

type Chunks = AsyncIterable<string | Uint8Array | RowsBlockChunk> | Iterable<string | Uint8Array | RowsBlockChunk>;

async function parse(chunks: Chunks, o: ReturnType<typeof resolve>, keepSamples: boolean, sharedSamples = false): Promise<TraceParser> {
  const parser = new TraceParser({ fileName: o.fileName, maxRows: o.maxRows, layerCount: o.layerCount, keepSamples, sharedSamples });
  const decoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false });
  let bytes = 0;
  let lineNo = 0;
  let carry = '';
  let first = true;
  // Byte chunks are read as bytes, line by line (readBytes); string chunks as text (feed). The
  // first chunk decides; a chunk of the other kind is converted.
  let mode: 'bytes' | 'text' | null = null;
  // the input's size, until the columns are sized from it (ReadTraceOptions.expectedBytes)
  let sizeBytes = keepSamples && o.expectedBytes && o.expectedBytes > 0 ? o.expectedBytes : 0;

  const feed = (text: string): void => {
    if (first && text.length > 0) {
      first = false;
      if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    }
    let start = 0;
    let nl = text.indexOf('\n');
    if (carry.length > 0) {
      if (nl < 0) {
        carry += text;
        if (carry.length > o.maxLineLength) tooLong(lineNo + 1);
        return;
      }
      const joined = carry + text.substring(0, nl);
      if (!parser.rowAt(joined, 0, joined.length)) parser.line(joined, lineNo + 1);
      lineNo++;
      carry = '';
      start = nl + 1;
      nl = text.indexOf('\n', start);
    }
    // Ordinary data rows are read in place (rowAt); any other line goes through line().
    while (nl >= 0) {
      lineNo++;
      if (!parser.rowAt(text, start, nl)) parser.line(text.substring(start, nl), lineNo);
      start = nl + 1;
      nl = text.indexOf('\n', start);
    }
    carry = text.substring(start);
    if (carry.length > o.maxLineLength) tooLong(lineNo + 1);
  };
  const tooLong = (line: number): never =>
    parser.fail(line, 'line_too_long', `line longer than ${o.maxLineLength} characters (is this a trace CSV?)`);
  const decode = (bytesIn?: Uint8Array): string => {
    try {
      return bytesIn ? decoder.decode(bytesIn, { stream: true }) : decoder.decode();
    } catch {
      // find the line of the first bad byte: decode leniently and count the newlines before U+FFFD
      const lenient = bytesIn ? new TextDecoder('utf-8').decode(bytesIn) : '';
      const bad = lenient.indexOf('\uFFFD');
      let line = lineNo + 1;
      for (let i = lenient.indexOf('\n'); i >= 0 && i < bad; i = lenient.indexOf('\n', i + 1)) line++;
      return parser.fail(line, 'bad_encoding', 'the text is not valid UTF-8');
    }
  };

  // Bytes: an ordinary data row is ASCII and read in place (rowBytes), never decoded; any other
  // line is decoded on its own (a newline byte never occurs inside a UTF-8 sequence, so every line
  // is whole text), the first with its byte-order marks dropped as the stream decoder and feed drop them.
  const lineDecoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
  const firstLineDecoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false });
  const badEncoding = (line: number): never => parser.fail(line, 'bad_encoding', 'the text is not valid UTF-8');
  const slowLine = (b: Uint8Array, line: number): void => {
    let text: string;
    try {
      text = (line === 1 ? firstLineDecoder : lineDecoder).decode(b);
    } catch {
      return badEncoding(line);
    }
    if (line === 1 && text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    parser.line(text, line);
  };
  /** Whole lines' bytes as text (the file's first line's byte-order marks dropped as slowLine drops them); null when not valid UTF-8. */
  const decodeLines = (b: Uint8Array): string | null => {
    try {
      // feed drops a second mark at the file's start (first), and none after
      first = lineNo === 0;
      return (lineNo === 0 ? firstLineDecoder : lineDecoder).decode(b);
    } catch {
      return null;
    }
  };
  let pieces: Uint8Array[] = [];
  let pieceBytes = 0;
  const joinPieces = (tail: Uint8Array): Uint8Array => {
    const out = new Uint8Array(pieceBytes + tail.length);
    let at = 0;
    for (const p of pieces) {
      out.set(p, at);
      at += p.length;
    }
    out.set(tail, at);
    pieces = [];
    pieceBytes = 0;
    return out;
  };
  const holdPiece = (piece: Uint8Array): void => {
    pieces.push(piece.slice());
    pieceBytes += piece.length;
    // the limit is in characters: counted only once the bytes exceed it (not valid UTF-8: that fault first)
    if (pieceBytes > o.maxLineLength) {
      const d = new TextDecoder('utf-8', { fatal: true, ignoreBOM: lineNo > 0 });
      let chars = 0;
      try {
        for (const p of pieces) chars += d.decode(p, { stream: true }).length;
      } catch {
        badEncoding(lineNo + 1);
      }
      if (chars > o.maxLineLength) tooLong(lineNo + 1);
    }
  };
  const readBytes = (chunk: Uint8Array): void => {
    let start = 0;
    let nl = chunk.indexOf(10);
    if (pieceBytes > 0) {
      if (nl < 0) {
        holdPiece(chunk);
        return;
      }
      const joined = joinPieces(chunk.subarray(0, nl));
      lineNo++;
      if (!parser.rowBytes(joined, 0, joined.length)) slowLine(joined, lineNo);
      start = nl + 1;
      nl = chunk.indexOf(10, start);
    }
    let wholeText = true;
    for (;;) {
      const rows = parser.rowCount;
      start = parser.rowsBytes(chunk, start, chunk.length);
      lineNo += parser.rowCount - rows;
      nl = chunk.indexOf(10, start);
      if (nl < 0) break;
      // A line rowsBytes could not read (metadata, the header, a fault), with the lines after it
      // that cannot start a data row: read as text in one decode, as feed reads them (a file of
      // many comment lines then makes no object per line); line by line where the decode fails,
      // for the first fault's line.
      let end = nl;
      for (let next = end + 1; next < chunk.length && !startsNumber(chunk[next]); next = end + 1) {
        const e = chunk.indexOf(10, next);
        if (e < 0) break;
        end = e;
      }
      const text = wholeText ? decodeLines(chunk.subarray(start, end + 1)) : null;
      if (text !== null) {
        feed(text);
        start = end + 1;
        continue;
      }
      wholeText = false;
      lineNo++;
      if (!parser.rowBytes(chunk, start, nl)) slowLine(chunk.subarray(start, nl), lineNo);
      start = nl + 1;
    }
    if (start < chunk.length) holdPiece(chunk.subarray(start));
    // the caller may reuse the chunk's memory once it hands over the next
    parser.detachPreviousTime();
  };

  for await (let chunk of chunks) {
    if (typeof chunk !== 'string' && !(chunk instanceof Uint8Array)) {
      // rows read apart: appended where the bytes so far ended on a line's end and rowsBytes would
      // read them alike here (TraceParser.appendRows), else read from their bytes
      const block = chunk.block;
      if (mode === 'bytes' && pieceBytes === 0 && carry.length === 0 && block && bytes + chunk.byteLength <= o.maxBytes && parser.appendRows(block)) {
        bytes += chunk.byteLength;
        lineNo += block.rows;
        continue;
      }
      chunk = chunk.bytes();
    }
    bytes += typeof chunk === 'string' ? utf8Length(chunk) : chunk.byteLength;
    if (bytes > o.maxBytes) {
      parser.fail(lineNo + 1, 'size_limit', `the file is larger than the size limit of ${formatBytes(o.maxBytes)}`);
    }
    mode ??= typeof chunk === 'string' ? 'text' : 'bytes';
    if (mode === 'bytes') readBytes(typeof chunk === 'string' ? new TextEncoder().encode(chunk) : chunk);
    else feed(typeof chunk === 'string' ? chunk : decode(chunk));
    if (sizeBytes && parser.rowCount >= 100) {
      // the whole input at the bytes a row read so far, with a twentieth to spare
      if (bytes < sizeBytes) parser.reserveRows(Math.ceil(parser.rowCount * (sizeBytes / bytes) * 1.05));
      sizeBytes = 0;
    }
  }
  if (mode === 'bytes') {
    if (pieceBytes > 0) {
      const last = joinPieces(new Uint8Array(0));
      lineNo++;
      if (!parser.rowBytes(last, 0, last.length)) slowLine(last, lineNo);
    }
  } else {
    feed(decode());
    if (carry.length > 0) parser.line(carry, ++lineNo);
  }
  parser.finish(Math.max(lineNo, 1));

  return parser;
}

/** readTrace on text already in memory (tests, small uploads). */
export function readTraceText(text: string, options: ReadTraceOptions = {}): Promise<TraceData> {
  return readTrace([text], options);
}

/** A byte that can open a plain decimal: a digit, a sign or a point. */
const startsNumber = (b: number): boolean => (b >= 48 && b <= 57) || b === 45 || b === 43 || b === 46;

function utf8Length(s: string): number {
  let n = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c < 0xdc00) {
      n += 4;
      i++;
    } else n += 3;
  }
  return n;
}

function formatBytes(b: number): string {
  return b % MIB === 0 ? `${b / MIB} MiB (${b} bytes)` : `${b} bytes`;
}

export { TraceFormatError };
