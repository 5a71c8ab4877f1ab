import { POW10, scanDecimal, scanDecimalBytesTo, scanned } from './plainDecimal';
import { SampleColumn } from './sampleColumn';
import { TraceFormatError } from './TraceFormatError';
import type { RowsBlock } from './rowsBlock';
import type { TraceWarning } from './types';

const KIND_IGNORE = 0;
const KIND_TIME = 1;
const KIND_SIGNAL = 2;
const KIND_LAYER = 3;
const KIND_CHIP = 4;
const KIND_CRYSTAL = 5;
const KIND_REFERENCE = 6;
const KNOWN: Record<string, number> = {
  time_s: KIND_TIME,
  signal: KIND_SIGNAL,
  layer: KIND_LAYER,
  chip: KIND_CHIP,
  crystal_nm: KIND_CRYSTAL,
  reference: KIND_REFERENCE,
};

/** Warnings of one kind listed in full; the rest are counted (a file of a million bad lines must not make a million messages). */
export const MAX_LISTED_WARNINGS = 20;

export interface ParserLimits {
  fileName?: string;
  maxRows: number;
  layerCount?: number;
  /** false: check every row but keep no samples (readTrace needs them; scanTrace does not). @default true */
  keepSamples?: boolean;
  /** The columns on SharedArrayBuffers from the start, so the rows read are handed to another thread without a copy (readTraceRows). */
  sharedSamples?: boolean;
}

/** Line-by-line state machine for the trace CSV of shared/FORMATS.md. */
export class TraceParser {
  readonly meta: Record<string, string> = {};
  readonly warnings: TraceWarning[] = [];
  columns: string[] = [];
  separator: ',' | '\t' = ',';
  headerLine = 0;
  rowCount = 0;
  time: SampleColumn<Float64Array>;
  signal: SampleColumn<Float64Array>;
  layer: SampleColumn<Int32Array> | null = null;
  chip: SampleColumn<Int32Array> | null = null;
  crystal: SampleColumn<Float64Array> | null = null;
  /** The lamp's reference-detector reading (a dual-beam monitor), only where the header names it. */
  reference: SampleColumn<Float64Array> | null = null;
  /** Highest layer number seen (0 without a layer column). */
  maxLayer = 0;
  private kinds = new Int8Array(0);
  private sawContent = false;
  private blankLine = 0;
  private prevTime = -Infinity;
  /** The previous row's time field as written, prevTimeSource[prevTimeFrom, prevTimeTo), for the message when time goes backwards (bytes: ASCII). */
  private prevTimeSource: string | Uint8Array = '';
  private prevTimeFrom = 0;
  private prevTimeTo = 0;
  /** The column each field of a row goes to (null: an ignored column). */
  private fieldColumns: (SampleColumn<Float64Array> | SampleColumn<Int32Array> | null)[] = [];
  private readonly warningCounts = new Map<string, { count: number; firstLine?: number }>();

  constructor(private readonly limits: ParserLimits) {
    this.time = this.column(Float64Array);
    this.signal = this.column(Float64Array);
  }

  private column<T extends Float64Array | Int32Array>(Of: { new (n: number): T; new (b: SharedArrayBuffer): T; BYTES_PER_ELEMENT: number }): SampleColumn<T> {
    const make = this.limits.sharedSamples ? (n: number) => new Of(new SharedArrayBuffer(n * Of.BYTES_PER_ELEMENT)) : (n: number) => new Of(n);
    return new SampleColumn(make, this.limits.keepSamples !== false);
  }

  /** Room for n rows in every column read (ReadTraceOptions.expectedBytes), at most the row limit. */
  reserveRows(n: number): void {
    const rows = Math.min(n, this.limits.maxRows);
    for (const c of [this.time, this.signal, this.layer, this.chip, this.crystal, this.reference]) c?.reserve(rows);
  }

  /** The samples of a column read with keepSamples (the default). */
  static samples<T extends Float64Array | Int32Array>(c: SampleColumn<T>, n: number): T {
    return c.take(n);
  }

  fail(line: number, code: string, detail: string, column?: string): never {
    const at = column === undefined ? -1 : this.columns.indexOf(column);
    throw new TraceFormatError({ fileName: this.limits.fileName, line, column, columnNumber: at >= 0 ? at + 1 : undefined, code, detail });
  }

  line(raw: string, lineNo: number): void {
    const s = raw.charCodeAt(raw.length - 1) === 13 ? raw.slice(0, -1) : raw;
    const blank = s.length === 0 || (s.charCodeAt(0) <= 32 && s.trim().length === 0);
    if (this.headerLine === 0) {
      if (blank) return;
      this.sawContent = true;
      if (s.charCodeAt(0) === 35) this.metadata(s, lineNo);
      else this.header(s, lineNo);
      return;
    }
    if (blank) {
      if (this.blankLine === 0) this.blankLine = lineNo;
      return;
    }
    if (this.blankLine !== 0) {
      this.fail(this.blankLine, 'blank_line', 'blank line inside the data (only trailing blank lines are allowed)');
    }
    if (s.charCodeAt(0) === 35) {
      this.fail(lineNo, 'metadata_after_header', 'a "#" metadata line after the header (metadata may only precede it)');
    }
    this.row(s, lineNo);
  }

  finish(lastLine: number): void {
    if (this.headerLine === 0) {
      if (!this.sawContent) this.fail(1, 'empty_file', 'the file is empty');
      this.fail(lastLine, 'no_header', 'no header row (expected one naming at least time_s and signal)');
    }
    if (this.rowCount === 0) this.fail(this.headerLine, 'no_data', 'the header is not followed by any data rows');
    for (const [code, c] of this.warningCounts) {
      if (c.count <= MAX_LISTED_WARNINGS) continue;
      this.warnings.push({
        code: `${code}_more`,
        message: `${c.count - MAX_LISTED_WARNINGS} more "${code}" warnings not listed (${c.count} in all, the first at line ${c.firstLine})`,
      });
    }
  }

  private warn(w: TraceWarning): void {
    const c = this.warningCounts.get(w.code) ?? { count: 0, firstLine: w.line };
    c.count++;
    this.warningCounts.set(w.code, c);
    if (c.count <= MAX_LISTED_WARNINGS) this.warnings.push(w);
  }

  private metadata(s: string, lineNo: number): void {
    const body = s.slice(1);
    const colon = body.indexOf(':');
    const key = colon < 0 ? '' : body.slice(0, colon).trim();
    if (key === '') {
      this.warn({
        code: 'metadata_malformed',
        line: lineNo,
        message: `line ${lineNo}: metadata line is not "# key: value"; ignored`,
      });
      return;
    }
    if (key in this.meta) {
      this.warn({ code: 'metadata_duplicate', line: lineNo, message: `line ${lineNo}: metadata key "${key}" repeated; the last value is kept` });
    }
    this.meta[key] = body.slice(colon + 1).trim();
  }

  private header(s: string, lineNo: number): void {
    if (s.includes('\r')) this.fail(lineNo, 'bad_line_ends', 'lines must end in LF or CRLF (found a lone CR)');
    this.separator = s.includes('\t') ? '\t' : ',';
    const names = s.split(this.separator).map((f) => f.trim().replace(/^"(.*)"$/, '$1').trim().toLowerCase());
    if (names.every((f) => f !== '' && Number.isFinite(Number(f)))) {
      this.fail(lineNo, 'no_header', `expected a header row naming the columns (time_s, signal, …) before the data, found "${s}"`);
    }
    this.kinds = new Int8Array(names.length);
    const seen = new Set<string>();
    names.forEach((name, i) => {
      if (name === '') this.fail(lineNo, 'empty_column_name', `header field ${i + 1} is empty`);
      if (seen.has(name)) this.fail(lineNo, 'duplicate_column', 'the column is named twice in the header', name);
      seen.add(name);
      const kind = KNOWN[name] ?? KIND_IGNORE;
      this.kinds[i] = kind;
      if (kind === KIND_IGNORE) {
        this.warn({ code: 'unknown_column', line: lineNo, message: `line ${lineNo}: unknown column "${name}" ignored` });
      }
    });
    for (const required of ['time_s', 'signal']) {
      if (!seen.has(required)) {
        this.fail(lineNo, 'missing_column', `the header has no "${required}" column (required: time_s, signal)`);
      }
    }
    if (seen.has('layer')) this.layer = this.column(Int32Array);
    if (seen.has('chip')) this.chip = this.column(Int32Array);
    if (seen.has('crystal_nm')) this.crystal = this.column(Float64Array);
    if (seen.has('reference')) this.reference = this.column(Float64Array);
    this.columns = names;
    this.headerLine = lineNo;
    const byKind = [null, this.time, this.signal, this.layer, this.chip, this.crystal, this.reference];
    this.fieldColumns = Array.from(this.kinds, (k) => byKind[k]);
  }

  /**
   * The fast path for an ordinary data row, text[start, end) (a CR before end is dropped):
   * plain decimals and nothing to report. Returns false, having changed nothing, for anything
   * else (blank, metadata, spaces, a bad or out-of-range value, time not increasing, too many
   * rows), and the caller passes the line to line(), which reads it or names the fault.
   */
  rowAt(text: string, start: number, end: number): boolean {
    if (this.headerLine === 0 || this.blankLine !== 0 || this.rowCount >= this.limits.maxRows) return false;
    if (end > start && text.charCodeAt(end - 1) === 13) end--;
    const sep = this.separator === ',' ? 44 : 9;
    const kinds = this.kinds, columns = this.fieldColumns, nFields = kinds.length;
    const r = this.rowCount;
    const layerLimit = this.limits.layerCount ?? Infinity;
    let pos = start, time = 0, timeStart = 0, timeEnd = 0, maxLayer = this.maxLayer;
    // Values go straight to row r of their columns: if the row is refused after all, line()
    // reads it again into the same row, or fails.
    for (let j = 0; j < nFields; j++) {
      const kind = kinds[j];
      let stop = pos;
      if (kind === KIND_IGNORE) {
        while (stop < end && text.charCodeAt(stop) !== sep) stop++;
      } else {
        const v = scanDecimal(text, pos, end, sep);
        if (v !== v) return false;
        stop = scanned.end;
        if (kind === KIND_TIME) {
          if (!(v > this.prevTime)) return false;
          time = v;
          timeStart = pos;
          timeEnd = stop;
        } else if (kind === KIND_LAYER) {
          if (!Number.isInteger(v) || v < 0 || v > layerLimit) return false;
          if (v > maxLayer) maxLayer = v;
        } else if (kind === KIND_CHIP) {
          if (!Number.isInteger(v) || v < 1) return false;
        } else if (kind === KIND_REFERENCE) {
          if (!(v > 0)) return false;
        }
        columns[j]!.set(r, v);
      }
      // the last field runs to the line's end; any other must stop at a separator
      if ((j === nFields - 1) !== (stop === end)) return false;
      pos = stop + 1;
    }
    this.prevTime = time;
    this.maxLayer = maxLayer;
    this.prevTimeSource = text;
    this.prevTimeFrom = timeStart;
    this.prevTimeTo = timeEnd;
    this.rowCount = r + 1;
    return true;
  }

  /**
   * rowAt on bytes[start, end) of an ASCII-compatible encoding (UTF-8): an ordinary data row is all
   * ASCII (digits, signs, '.', 'e', separators), so it reads the same as its text would; anything
   * else returns false, for the caller to decode the line and pass it to line().
   */
  rowBytes(bytes: Uint8Array, start: number, end: number): boolean {
    if (this.headerLine === 0 || this.blankLine !== 0 || this.rowCount >= this.limits.maxRows) return false;
    if (end > start && bytes[end - 1] === 13) end--;
    const sep = this.separator === ',' ? 44 : 9;
    const kinds = this.kinds, columns = this.fieldColumns, nFields = kinds.length;
    const r = this.rowCount;
    const layerLimit = this.limits.layerCount ?? Infinity;
    let pos = start, time = 0, timeStart = 0, timeEnd = 0, maxLayer = this.maxLayer;
    for (let j = 0; j < nFields; j++) {
      const kind = kinds[j];
      let stop = pos;
      if (kind === KIND_IGNORE) {
        // an ignored field is skipped whatever it holds, but only ASCII keeps bytes and characters alike
        while (stop < end && bytes[stop] !== sep) {
          if (bytes[stop] >= 0x80) return false;
          stop++;
        }
      } else {
        scanDecimalBytesTo(bytes, pos, end, sep);
        const v = scanned.value;
        if (v !== v) return false;
        stop = scanned.end;
        if (kind === KIND_TIME) {
          if (!(v > this.prevTime)) return false;
          time = v;
          timeStart = pos;
          timeEnd = stop;
        } else if (kind === KIND_LAYER) {
          if (!Number.isInteger(v) || v < 0 || v > layerLimit) return false;
          if (v > maxLayer) maxLayer = v;
        } else if (kind === KIND_CHIP) {
          if (!Number.isInteger(v) || v < 1) return false;
        } else if (kind === KIND_REFERENCE) {
          if (!(v > 0)) return false;
        }
        columns[j]!.set(r, v);
      }
      if ((j === nFields - 1) !== (stop === end)) return false;
      pos = stop + 1;
    }
    this.prevTime = time;
    this.maxLayer = maxLayer;
    this.prevTimeSource = bytes;
    this.prevTimeFrom = timeStart;
    this.prevTimeTo = timeEnd;
    this.rowCount = r + 1;
    return true;
  }

  /**
   * rowBytes over the lines of bytes[start, end) that end in '\n', one after another, with the
   * parser's state held in locals: returns where it stopped, the start of the first line that is
   * not an ordinary data row (for the caller to pass to line()) or of the unended rest. Each row
   * read adds one to rowCount (and to the caller's line count).
   */
  rowsBytes(bytes: Uint8Array, start: number, end: number): number {
    if (this.headerLine === 0 || this.blankLine !== 0 || !this.time.keep) return start;
    const sep = this.separator === ',' ? 44 : 9;
    const kinds = this.kinds, nFields = kinds.length, columns = this.fieldColumns;
    const maxRows = this.limits.maxRows, layerLimit = this.limits.layerCount ?? Infinity;
    // Filled by a loop and refreshed in place after a growth, never rebuilt by map(): V8's
    // optimised map() makes an array of another element kind than the interpreter's, and reading
    // it then deoptimises this loop (a recompile for each chunk of a large file).
    const arrays: (Float64Array | Int32Array | null)[] = [];
    for (let j = 0; j < nFields; j++) arrays.push(columns[j]?.data ?? null);
    rowState[0] = this.rowCount;
    rowState[1] = this.prevTime;
    rowState[2] = this.maxLayer;
    rowState[3] = -1;
    rowState[4] = -1;
    const lineStart = readRows(bytes, start, end, sep, kinds, columns, arrays, this.time, maxRows, layerLimit);
    const r = rowState[0], prevTime = rowState[1], maxLayer = rowState[2], timeStart = rowState[3], timeEnd = rowState[4];
    if (timeStart >= 0) {
      this.prevTimeSource = bytes;
      this.prevTimeFrom = timeStart;
      this.prevTimeTo = timeEnd;
    }
    this.prevTime = prevTime;
    this.maxLayer = maxLayer;
    this.rowCount = r;
    return lineStart;
  }

  /**
   * Appends rows read apart (rowsBlock.ts) where rowsBytes, reading their bytes here and now,
   * would read every one of them as a row with the same values: under the same header, in the
   * data (no blank line before), the first row's time after the last one's here, within the row
   * limit. Returns false, having changed nothing, anywhere else (the caller reads the bytes).
   */
  appendRows(b: RowsBlock): boolean {
    if (this.headerLine === 0 || this.blankLine !== 0 || !this.time.keep) return false;
    if (b.separator !== this.separator || b.columns.length !== this.columns.length || b.columns.some((c, j) => c !== this.columns[j])) return false;
    if (b.rows === 0) return true;
    if (!(b.firstTimeS > this.prevTime) || this.rowCount + b.rows > this.limits.maxRows || b.maxLayer > (this.limits.layerCount ?? Infinity)) return false;
    const columns = this.fieldColumns;
    const same = (c: (typeof columns)[number], f: RowsBlock['fields'][number]) =>
      c === null ? f === null : f !== null && f.length === b.rows && Object.getPrototypeOf(f) === Object.getPrototypeOf(c.data);
    if (b.fields.length !== columns.length || columns.some((c, j) => !same(c, b.fields[j]))) return false;
    columns.forEach((c, j) => c?.setRows(this.rowCount, b.fields[j] as never));
    this.rowCount += b.rows;
    this.prevTime = b.lastTimeS;
    this.prevTimeSource = b.lastTimeText;
    this.prevTimeFrom = 0;
    this.prevTimeTo = b.lastTimeText.length;
    if (b.maxLayer > this.maxLayer) this.maxLayer = b.maxLayer;
    return true;
  }

  /** The previous row's time field as written. */
  previousTimeText(): string {
    return this.previousTime();
  }

  /** One value per header field: of(column) for a read column, null for an ignored one. */
  fieldColumnsOf<T>(of: (c: SampleColumn<Float64Array> | SampleColumn<Int32Array>) => T): (T | null)[] {
    return this.fieldColumns.map((c) => (c ? of(c) : null));
  }

  /** Keeps the previous time field as text, not as a view of bytes its caller may reuse. */
  detachPreviousTime(): void {
    if (typeof this.prevTimeSource === 'string') return;
    this.prevTimeSource = this.previousTime();
    this.prevTimeFrom = 0;
    this.prevTimeTo = this.prevTimeSource.length;
  }

  private previousTime(): string {
    const src = this.prevTimeSource;
    if (typeof src === 'string') return src.substring(this.prevTimeFrom, this.prevTimeTo);
    return new TextDecoder().decode(src.subarray(this.prevTimeFrom, this.prevTimeTo));
  }

  private row(s: string, lineNo: number): void {
    const r = this.rowCount;
    if (r >= this.limits.maxRows) {
      this.fail(lineNo, 'row_limit', `more than ${this.limits.maxRows} data rows (the row limit is ${this.limits.maxRows})`);
    }
    const sep = this.separator;
    const nFields = this.kinds.length;
    let pos = 0;
    for (let j = 0; j < nFields; j++) {
      let end = s.indexOf(sep, pos);
      if (end < 0) {
        if (j < nFields - 1) this.fieldCount(s, lineNo);
        end = s.length;
      } else if (j === nFields - 1) this.fieldCount(s, lineNo);
      const kind = this.kinds[j];
      if (kind !== KIND_IGNORE) this.value(kind, j, s.substring(pos, end), lineNo, r);
      pos = end + 1;
    }
    this.rowCount = r + 1;
  }

  private fieldCount(s: string, lineNo: number): never {
    const found = s.split(this.separator).length;
    const n = this.kinds.length;
    return this.fail(lineNo, 'field_count', `expected ${n} fields (${this.columns.join(', ')}), found ${found}`);
  }

  private value(kind: number, j: number, text: string, lineNo: number, r: number): void {
    const v = Number(text);
    if (!Number.isFinite(v) || badNumberText(text, v)) {
      const t = text.trim();
      const infinite = t === 'NaN' || (!Number.isNaN(v) && !Number.isFinite(v));
      const what = t === '' ? 'empty value where a number is needed' : infinite ? `"${t}" is not a finite number` : `"${t}" is not a number`;
      this.fail(lineNo, infinite ? 'not_finite' : 'not_a_number', what, this.columns[j]);
    }
    switch (kind) {
      case KIND_TIME:
        if (!(v > this.prevTime)) {
          this.fail(
            lineNo,
            'time_not_increasing',
            `${text.trim()} is not after the previous time ${this.previousTime().trim()} (line ${lineNo - 1}); time must be strictly increasing`,
            this.columns[j],
          );
        }
        this.prevTime = v;
        this.prevTimeSource = text;
        this.prevTimeFrom = 0;
        this.prevTimeTo = text.length;
        this.time.set(r, v);
        break;
      case KIND_SIGNAL:
        this.signal.set(r, v);
        break;
      case KIND_LAYER:
        if (!Number.isInteger(v) || v < 0) {
          this.fail(lineNo, 'bad_layer', `"${text.trim()}" is not a layer number (a non-negative integer)`, this.columns[j]);
        }
        if (this.limits.layerCount !== undefined && v > this.limits.layerCount) {
          this.fail(lineNo, 'layer_out_of_range', `layer ${v} is beyond the design's ${this.limits.layerCount} layers`, this.columns[j]);
        }
        if (v > this.maxLayer) this.maxLayer = v;
        this.layer!.set(r, v);
        break;
      case KIND_CHIP:
        if (!Number.isInteger(v) || v < 1) {
          this.fail(lineNo, 'bad_chip', `"${text.trim()}" is not a chip number (a positive integer)`, this.columns[j]);
        }
        this.chip!.set(r, v);
        break;
      case KIND_REFERENCE:
        // the signal is divided by it (fit/lampReference.ts): a reading of the lamp is positive
        if (!(v > 0)) {
          this.fail(lineNo, 'bad_reference', `"${text.trim()}" is not a lamp reference reading (a positive number)`, this.columns[j]);
        }
        this.reference!.set(r, v);
        break;
      default:
        this.crystal!.set(r, v);
    }
  }
}

/** Number() also accepts "", "  ", "0x1A", "0b1", "0o7"; a trace must not. */
function badNumberText(text: string, v: number): boolean {
  if (v === 0 && text.trim() === '') return true;
  return text.length >= 3 && Number.isInteger(v) && /^\s*[+-]?0[xob]/i.test(text);
}

/**
 * rowsBytes' state after each row read by readRows: rowCount, prevTime, maxLayer, and where the
 * last row's time field starts and ends (−1 before the first row).
 */
const rowState = new Float64Array(5);

/** fastRow's results beside its return value (numbers in module variables, not an object per row). */
let fastTime = 0, fastMaxLayer = 0, fastTimeStart = 0, fastTimeEnd = 0;

/**
 * Row r from lineStart when every field is a plain decimal that passes its column's checks and the
 * last one ends the line ("\n", or "\r\n" where crlf) before end: its values written to arrays,
 * the start of the next line returned (its time, span and the running layer maximum in the fast*
 * variables). −1 for anything else, written or not: readRows then reads the row field by field,
 * which takes it or refuses it the same as ever.
 */
function fastRow(
  bytes: Uint8Array, lineStart: number, end: number, sep: number, crlf: boolean, kinds: Int8Array,
  arrays: (Float64Array | Int32Array | null)[], r: number, prevTime: number, maxLayer: number, layerLimit: number,
): number {
  const nFields = kinds.length, last = nFields - 1;
  let pos = lineStart, time = 0, tStart = 0, tEnd = 0;
  for (let j = 0; j < nFields; j++) {
    const kind = kinds[j];
    if (kind === KIND_IGNORE) return -1;
    const stopAt = j === last ? (crlf ? 13 : 10) : sep;
    // The usual field, [-]digits[.digits] with at most 15 digits, read here as scanDecimalBytesTo
    // reads it (the same value: M/10^f, or M, negated); any other through that function. Read in
    // line, not called: four calls a row were a third of a large trace's read. (Its digit loops
    // are that function's, copied: a change to one is a change to both; the byte and text paths'
    // property test reads a difference.)
    let i = pos, c = i < end ? bytes[i] : 0;
    const negative = c === 45; // '-'
    if (negative) c = ++i < end ? bytes[i] : 0;
    let mantissa = 0, digits = 0, fraction = 0;
    while (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      c = ++i < end ? bytes[i] : 0;
    }
    if (c === 46) { // '.'
      c = ++i < end ? bytes[i] : 0;
      while (c >= 48 && c <= 57) {
        mantissa = mantissa * 10 + (c - 48);
        digits++;
        fraction++;
        c = ++i < end ? bytes[i] : 0;
      }
    }
    let v: number, stop: number;
    if (c === stopAt && i < end && digits > 0 && digits <= 15 && fraction <= 22) {
      v = fraction > 0 ? mantissa / POW10[fraction] : mantissa;
      if (negative) v = -v;
      stop = i;
    } else {
      scanDecimalBytesTo(bytes, pos, end, stopAt);
      v = scanned.value;
      if (v !== v) return -1;
      stop = scanned.end;
      if (stop >= end) return -1;
    }
    if (kind === KIND_TIME) {
      if (!(v > prevTime)) return -1;
      time = v;
      tStart = pos;
      tEnd = stop;
    } else if (kind === KIND_LAYER) {
      if (!Number.isInteger(v) || v < 0 || v > layerLimit) return -1;
      if (v > maxLayer) maxLayer = v;
    } else if (kind === KIND_CHIP) {
      if (!Number.isInteger(v) || v < 1) return -1;
    } else if (kind === KIND_REFERENCE && !(v > 0)) {
      return -1;
    }
    arrays[j]![r] = v;
    pos = stop + 1;
  }
  if (crlf) {
    if (pos >= end || bytes[pos] !== 10) return -1;
    pos++;
  }
  fastTime = time;
  fastTimeStart = tStart;
  fastTimeEnd = tEnd;
  fastMaxLayer = maxLayer;
  return pos;
}

/**
 * The loop of rowsBytes from lineStart, its state in rowState (updated row by row), returning
 * where it stopped. A function of its own with nothing after the loop but the return: the engine
 * compiles the loop on the stack while its first chunk is read, and code after the loop, never run
 * by then, had no type feedback and threw that compiled code away at the end of chunk after chunk.
 */
function readRows(
  bytes: Uint8Array, lineStart: number, end: number, sep: number, kinds: Int8Array,
  columns: readonly (SampleColumn<Float64Array> | SampleColumn<Int32Array> | null)[],
  arrays: (Float64Array | Int32Array | null)[], time0: SampleColumn<Float64Array>, maxRows: number, layerLimit: number,
): number {
  const nFields = kinds.length;
  let r = rowState[0], prevTime = rowState[1], maxLayer = rowState[2], timeStart = rowState[3], timeEnd = rowState[4];
  let capacity = time0.data.length;
  // The first row tells whether lines end in "\r\n"; then a row of plain decimals is read in one
  // pass to its line end (fastRow), and only a row it refuses is looked at field by field below,
  // its line end found first (a search per row cost about a seventh of a large trace's read).
  let crlf = -1;
  while (r < maxRows) {
    if (crlf < 0) {
      const nl = bytes.indexOf(10, lineStart);
      if (nl < 0 || nl >= end) break;
      crlf = nl > lineStart && bytes[nl - 1] === 13 ? 1 : 0;
    }
    if (r < capacity) {
      const next = fastRow(bytes, lineStart, end, sep, crlf === 1, kinds, arrays, r, prevTime, maxLayer, layerLimit);
      if (next >= 0) {
        maxLayer = fastMaxLayer;
        prevTime = fastTime;
        timeStart = fastTimeStart;
        timeEnd = fastTimeEnd;
        r++;
        lineStart = next;
        rowState[0] = r;
        rowState[1] = prevTime;
        rowState[2] = maxLayer;
        rowState[3] = timeStart;
        rowState[4] = timeEnd;
        continue;
      }
    }
    const nl = bytes.indexOf(10, lineStart);
    if (nl < 0 || nl >= end) break;
    const stopAt = nl > lineStart && bytes[nl - 1] === 13 ? nl - 1 : nl;
    if (r >= capacity) {
      for (const c of columns) c?.grow();
      for (let j = 0; j < nFields; j++) arrays[j] = columns[j]?.data ?? null;
      capacity = time0.data.length;
    }
    let pos = lineStart, ok = true, time = 0, tStart = 0, tEnd = 0, layerMax = maxLayer;
    for (let j = 0; j < nFields; j++) {
      const kind = kinds[j];
      let stop = pos;
      if (kind === KIND_IGNORE) {
        while (stop < stopAt && bytes[stop] !== sep) {
          if (bytes[stop] >= 0x80) break;
          stop++;
        }
        if (stop < stopAt && bytes[stop] !== sep) {
          ok = false;
          break;
        }
      } else {
        scanDecimalBytesTo(bytes, pos, stopAt, sep);
        const v = scanned.value;
        if (v !== v) {
          ok = false;
          break;
        }
        stop = scanned.end;
        if (kind === KIND_TIME) {
          if (!(v > prevTime)) {
            ok = false;
            break;
          }
          time = v;
          tStart = pos;
          tEnd = stop;
        } else if (kind === KIND_LAYER) {
          if (!Number.isInteger(v) || v < 0 || v > layerLimit) {
            ok = false;
            break;
          }
          if (v > layerMax) layerMax = v;
        } else if (kind === KIND_CHIP) {
          if (!Number.isInteger(v) || v < 1) {
            ok = false;
            break;
          }
        } else if (kind === KIND_REFERENCE && !(v > 0)) {
          ok = false;
          break;
        }
        arrays[j]![r] = v;
      }
      if ((j === nFields - 1) !== (stop === stopAt)) {
        ok = false;
        break;
      }
      pos = stop + 1;
    }
    if (!ok) break;
    prevTime = time;
    maxLayer = layerMax;
    timeStart = tStart;
    timeEnd = tEnd;
    r++;
    lineStart = nl + 1;
    rowState[0] = r;
    rowState[1] = prevTime;
    rowState[2] = maxLayer;
    rowState[3] = timeStart;
    rowState[4] = timeEnd;
  }
  return lineStart;
}
