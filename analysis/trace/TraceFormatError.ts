/** A trace file that breaks the format of shared/FORMATS.md; the message names file, line and column. */
export class TraceFormatError extends Error {
  readonly fileName?: string;
  /** 1-based line of the file. */
  readonly line: number;
  /** Header name of the offending column, where one applies. */
  readonly column?: string;
  /** 1-based position of that column in the header, where known. */
  readonly columnNumber?: number;
  /** Stable machine-readable code, e.g. `not_a_number`, `missing_column`. */
  readonly code: string;

  constructor(init: { fileName?: string; line: number; column?: string; columnNumber?: number; code: string; detail: string }) {
    const where = `${init.fileName ? `${init.fileName} ` : ''}line ${init.line}`;
    const col = init.column === undefined ? '' : `, column "${init.column}"`;
    super(`${where}${col}: ${init.detail}`);
    this.name = 'TraceFormatError';
    this.fileName = init.fileName;
    this.line = init.line;
    this.column = init.column;
    this.columnNumber = init.columnNumber;
    this.code = init.code;
  }
}
