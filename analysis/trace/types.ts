/** A non-fatal finding about a trace or its segmentation. */
export interface TraceWarning {
  /** Stable machine-readable code, e.g. `time_gap`, `few_samples`, `saturated_max`. */
  code: string;
  message: string;
  /** 1-based line of the trace file, where one applies. */
  line?: number;
  /** Design layer (1-based), where one applies. */
  layer?: number;
}

export interface ReadTraceOptions {
  /** Name used in messages, e.g. `trace.csv`. */
  fileName?: string;
  /** Largest accepted input, in bytes (UTF-8). @default 209715200 (200 MiB) */
  maxBytes?: number;
  /** Largest accepted number of data rows. @default 5000000 */
  maxRows?: number;
  /** Number of layers of the design; a layer number above it is an error. @default unchecked */
  layerCount?: number;
  /** A time step above gapFactor × the median step is reported as a gap. @default 5 */
  gapFactor?: number;
  /** A layer with fewer samples than this is reported. @default 20 */
  minLayerSamples?: number;
  /** Longest accepted line, in characters. @default 1048576 */
  maxLineLength?: number;
  /**
   * The input's size in bytes when known (a file's): once the first chunk is read, the columns
   * are sized for the rows that many bytes hold at that chunk's bytes a row, not grown by
   * doubling from a thousand rows (a wrong size only costs a copy). @default unknown
   */
  expectedBytes?: number;
}

/** What scanTrace learns of a trace without keeping its samples. */
export interface TraceScan {
  meta: Record<string, string>;
  columns: string[];
  rowCount: number;
  /** Highest layer number in the layer column (0 without one). */
  maxLayer: number;
  warnings: TraceWarning[];
  headerLine: number;
}

/** A parsed trace: one typed array per known column, all of length rowCount. */
export interface TraceData {
  /** `# key: value` lines before the header, keys as written (trimmed). */
  meta: Record<string, string>;
  /** Header names as written (trimmed, lower-cased), in file order, including ignored ones. */
  columns: string[];
  timeS: Float64Array;
  signal: Float64Array;
  layer: Int32Array | null;
  chip: Int32Array | null;
  crystalNm: Float64Array | null;
  /**
   * The lamp's reference-detector reading (a dual-beam monitor; arbitrary units, > 0), where the
   * file has a `reference` column; absent otherwise (no array is kept for it).
   */
  reference?: Float64Array;
  rowCount: number;
  warnings: TraceWarning[];
  /** Separator found in the header. */
  separator: ',' | '\t';
  /** 1-based line of the header; data row i sits on line headerLine + 1 + i. */
  headerLine: number;
}

/** A contiguous stretch of samples, [startIndex, endIndex). */
export interface Segment {
  /** Design layer (1-based); 0 for an idle stretch. */
  layer: number;
  chip: number;
  startIndex: number;
  /** Exclusive. */
  endIndex: number;
  startTimeS: number;
  /** Time of the last sample in the segment. */
  endTimeS: number;
  sampleCount: number;
  /** 1 for a layer's first contiguous run, 2 for its second (a paused layer), … */
  run: number;
  /** Placed without a layer column (fit/levelCutEnds.ts): the spread of the start and of the end the readings allow, s. */
  startSigmaS?: number;
  endSigmaS?: number;
}

export interface Segmentation {
  layers: Segment[];
  idle: Segment[];
  warnings: TraceWarning[];
  /** True when the segments were found from the signal, not from a layer column. */
  inferred: boolean;
}
