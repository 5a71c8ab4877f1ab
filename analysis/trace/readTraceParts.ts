import { parse, readTrace, resolve } from './readTrace';
import { traceWarnings } from './traceWarnings';
import type { SampleColumn } from './sampleColumn';
import type { TraceParser } from './traceParser';
import type { ReadTraceOptions, TraceData, TraceWarning } from './types';

// A trace read in two parts, each on its own thread (analysis/cli/analyze.ts): the head, from the
// file's start to a line boundary near its middle, and the tail, from there to the end, read
// after the file's lines up to its header so it knows the columns. Joined, they make the TraceData
// readTrace makes of the whole; wherever the join could differ (a fault in the tail, time not
// increasing across the boundary, the row limit) it gives null and the caller reads the whole.

/** The chunk size of Node's file streams (fs.createReadStream's default highWaterMark): the parts are read in the chunks a streamed read would see, so a fault reads the same. */
export const STREAM_CHUNK = 64 * 1024;

export interface TraceSplit {
  /** Byte offset just past the header line. */
  headerEnd: number;
  /** Byte offset of the tail's first line (just past a '\n'). */
  at: number;
}

export interface SplitOptions {
  /** Files smaller than this are read whole on one thread. @default 4 MiB */
  minBytes?: number;
  /** Where the split is looked for, as a fraction of the file. @default 0.5 */
  fraction?: number;
  /** The header must end within this many bytes of the file's start. @default 64 KiB */
  headerWithin?: number;
}

/** One part's samples and what the join checks. Plain data with typed arrays: it crosses threads. */
export interface TracePart {
  meta: Record<string, string>;
  columns: string[];
  separator: ',' | '\t';
  headerLine: number;
  warnings: TraceWarning[];
  rowCount: number;
  /** The part's first line (1 for the head) and its last (counted by newlines). */
  firstLine: number;
  lastLine: number;
  timeS: Float64Array;
  signal: Float64Array;
  layer: Int32Array | null;
  chip: Int32Array | null;
  crystalNm: Float64Array | null;
}

/** A byte that can open a plain decimal: a digit, a sign or a point (as readTrace's). */
const startsNumber = (b: number): boolean => (b >= 48 && b <= 57) || b === 45 || b === 43 || b === 46;

/**
 * Where to split a trace's bytes: the header ends near the start (only "#" lines and blank
 * lines before it), and the lines on both sides of the split open with a number (data rows, not
 * a comment or blank line). Null: read the file whole (small, header far in, or no such line
 * within 64 lines of the middle).
 */
export function splitTrace(bytes: Uint8Array, options: SplitOptions = {}): TraceSplit | null {
  const minBytes = options.minBytes ?? 4 * 1024 * 1024;
  const headerWithin = options.headerWithin ?? 64 * 1024;
  if (bytes.length < minBytes || bytes.length < 2) return null;
  let headerEnd = -1;
  for (let pos = 0; pos < headerWithin && pos < bytes.length; ) {
    const nl = bytes.indexOf(10, pos);
    if (nl < 0) return null;
    let s = pos;
    if (pos === 0 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) s = 3;
    let blank = true;
    for (let i = s; i < nl; i++) {
      if (bytes[i] > 32) {
        blank = false;
        break;
      }
    }
    if (!blank && bytes[s] !== 35) {
      headerEnd = nl + 1;
      break;
    }
    pos = nl + 1;
  }
  if (headerEnd < 0) return null;
  const from = Math.max(headerEnd, Math.floor(bytes.length * (options.fraction ?? 0.5)));
  // the line holding `from`, then up to 64 lines on
  let lineStart = bytes.lastIndexOf(10, from - 1) + 1;
  for (let tries = 0; tries < 64 && lineStart < bytes.length; tries++) {
    const nl = bytes.indexOf(10, lineStart);
    if (nl < 0 || nl + 1 >= bytes.length) return null;
    if (lineStart >= headerEnd && startsNumber(bytes[lineStart]) && startsNumber(bytes[nl + 1])) {
      return { headerEnd, at: nl + 1 };
    }
    lineStart = nl + 1;
  }
  return null;
}

/** bytes[from, to) in the chunks a streamed read from `base` would see. */
function* chunksOf(bytes: Uint8Array, from: number, to: number, base: number): Generator<Uint8Array> {
  let at = from;
  while (at < to) {
    const end = Math.min(to, base + (Math.floor((at - base) / STREAM_CHUNK) + 1) * STREAM_CHUNK);
    yield bytes.subarray(at, end);
    at = end;
  }
}

/** The parser's samples as views of its own storage, not copied (the join copies them once, into the whole's arrays). */
function partOf(parser: TraceParser, firstLine: number, lastLine: number): TracePart {
  const n = parser.rowCount;
  const view = <T extends Float64Array | Int32Array>(c: SampleColumn<T> | null): T | null => (c ? (c.data.subarray(0, n) as T) : null);
  return {
    meta: parser.meta,
    columns: parser.columns,
    separator: parser.separator,
    headerLine: parser.headerLine,
    warnings: parser.warnings,
    rowCount: n,
    firstLine,
    lastLine,
    timeS: view(parser.time)!,
    signal: view(parser.signal)!,
    layer: view(parser.layer),
    chip: view(parser.chip),
    crystalNm: view(parser.crystal),
  };
}

/**
 * The head, bytes[0, split.at), read as readTrace reads a streamed file. Throws the first fault
 * of those lines, which is the file's first; null when the head holds no header or no data row
 * (the whole file's read then names the fault).
 */
export async function readTraceHead(bytes: Uint8Array, split: TraceSplit, options: ReadTraceOptions = {}): Promise<TracePart | null> {
  const o = resolve(options);
  const { parser, lineCount } = await parse(chunksOf(bytes, 0, split.at, 0), o, true, { finish: false });
  if (parser.headerLine === 0 || parser.rowCount === 0) return null;
  // the warnings past the cap are counted here: the tail's data rows add none (the join checks)
  parser.finish(lineCount);
  return partOf(parser, 1, lineCount);
}

/** The tail, bytes[split.at, end), its lines numbered as in the file. Throws a fault of its own lines (the caller reads the whole file then, for the first fault). */
export async function readTraceTail(bytes: Uint8Array, split: TraceSplit, options: ReadTraceOptions = {}): Promise<TracePart> {
  const o = resolve(options);
  let firstLine = 1;
  for (let i = bytes.indexOf(10); i >= 0 && i < split.at; i = bytes.indexOf(10, i + 1)) firstLine++;
  const { parser, lineCount } = await parse(chunksOf(bytes, split.at, bytes.length, split.at), o, true, {
    prefix: bytes.subarray(0, split.headerEnd),
    firstLine,
    finish: false,
  });
  return partOf(parser, firstLine, lineCount);
}

function joined<T extends Float64Array | Int32Array>(a: T | null, b: T | null, make: (n: number) => T): T | null {
  if (!a || !b) return null;
  const out = make(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}

/** The TraceData readTrace makes of the whole file, from its head and tail; null where it could differ. */
export function joinTraceParts(head: TracePart, tail: TracePart, options: ReadTraceOptions = {}): TraceData | null {
  const o = resolve(options);
  const same =
    tail.headerLine === head.headerLine &&
    tail.separator === head.separator &&
    tail.columns.length === head.columns.length &&
    tail.columns.every((c, i) => c === head.columns[i]) &&
    tail.firstLine === head.lastLine + 1 &&
    tail.rowCount > 0 &&
    // the tail was read with no previous time: the one-thread read compares its first row with the head's last
    tail.timeS[0] > head.timeS[head.rowCount - 1] &&
    head.rowCount + tail.rowCount <= o.maxRows &&
    // the tail's only warnings are its copy of the lines up to the header
    tail.warnings.every((w) => w.line !== undefined && w.line <= tail.headerLine);
  if (!same) return null;
  const f64 = (n: number) => new Float64Array(n);
  const i32 = (n: number) => new Int32Array(n);
  const data: TraceData = {
    meta: head.meta,
    columns: head.columns,
    timeS: joined(head.timeS, tail.timeS, f64)!,
    signal: joined(head.signal, tail.signal, f64)!,
    layer: joined(head.layer, tail.layer, i32),
    chip: joined(head.chip, tail.chip, i32),
    crystalNm: joined(head.crystalNm, tail.crystalNm, f64),
    rowCount: head.rowCount + tail.rowCount,
    warnings: head.warnings,
    separator: head.separator,
    headerLine: head.headerLine,
  };
  data.warnings.push(...traceWarnings(data, { gapFactor: o.gapFactor, minLayerSamples: o.minLayerSamples }));
  return data;
}

/** A whole file's bytes read as a streamed read of it would be (the one-thread read, and the fallback). */
export function readTraceBytes(bytes: Uint8Array, options: ReadTraceOptions = {}): Promise<TraceData> {
  return readTrace(chunksOf(bytes, 0, bytes.length, 0), options);
}
