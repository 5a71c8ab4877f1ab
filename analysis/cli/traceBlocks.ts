import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { headerLineOf, readRowsBlock, type RowsBlock, type RowsBlockChunk } from '../trace/rowsBlock';

// A large trace is read on both threads of the analyze command: the main one reads the file from
// its start, block by block, while the second thread reads whole blocks from its end (each block
// the lines that start within BLOCK_BYTES of the file), the two meeting where the main one finds
// a block the other has begun. readTrace appends a block read there only where it reads as its
// bytes would read here (trace/rowsBlock.ts), and reads the bytes otherwise: the same trace, the
// same faults at the same lines.

/** Bytes a block: the size of the stream's reads that the command made before (1 MiB). */
export const BLOCK_BYTES = 1 << 20;
/** How far past a block's nominal start its first line start is looked for (a trace's longest line: 1 MiB). */
const LINE_SEARCH = (1 << 20) + 2;

/** What the second thread is asked for: block `index` of the file at `path`. */
export interface RowsBlockRequest {
  path: string;
  index: number;
  blockBytes: number;
  layerCount?: number;
}

/** Block `index`'s bytes [start, end) and its rows read there (null where not all are ordinary data rows). */
export interface RowsBlockAnswer {
  start: number;
  end: number;
  block: RowsBlock | null;
}

function readRange(fd: number, start: number, end: number): Uint8Array {
  const out = Buffer.allocUnsafe(end - start);
  let at = 0;
  while (at < out.length) {
    const n = readSync(fd, out, at, out.length - at, start + at);
    if (n === 0) throw new Error('the file ended before its size');
    at += n;
  }
  return out;
}

/** The first line start at or after byte x (0, or just after a line feed), size past the end; −1 when none is within LINE_SEARCH. */
function lineStartAt(fd: number, x: number, size: number): number {
  if (x <= 0) return 0;
  if (x >= size) return size;
  const from = x - 1;
  const window = readRange(fd, from, Math.min(size, from + LINE_SEARCH));
  const nl = window.indexOf(10);
  if (nl >= 0) return from + nl + 1;
  return from + window.length >= size ? size : -1;
}

const headers = new Map<string, string | null>();

/** The second thread's side: reads block `index` (its rows, or null where the block is not all data rows). */
export function rowsBlockFromFile(r: RowsBlockRequest): RowsBlockAnswer | null {
  let fd = -1;
  try {
    fd = openSync(r.path, 'r');
    const size = fstatSync(fd).size;
    let header = headers.get(r.path);
    if (header === undefined) {
      header = headerLineOf(readRange(fd, 0, Math.min(size, r.blockBytes)));
      headers.set(r.path, header);
    }
    if (header === null) return null;
    const start = lineStartAt(fd, r.index * r.blockBytes, size);
    const end = lineStartAt(fd, (r.index + 1) * r.blockBytes, size);
    if (start < 0 || end < start) return null;
    return { start, end, block: readRowsBlock(header, readRange(fd, start, end), end === size, r.layerCount) };
  } catch {
    return null;
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}

/**
 * The main thread's side: the file's chunks for readTrace, the blocks the second thread reads
 * (rowsBlockOf, asked for from the file's end down, each claimed here where not yet begun there)
 * given as RowsBlockChunk; null when the file is not read so (too small to split, or too large
 * for the default size limit, which then stops the plain read at its own line).
 */
export function fileChunksWithBlocks(
  path: string, layerCount: number, rowsBlockOf: (r: RowsBlockRequest) => PromiseLike<RowsBlockAnswer | null>, maxBytes: number,
): { chunks: AsyncIterable<Uint8Array | RowsBlockChunk>; close: () => void } | null {
  let fd: number, size: number;
  try {
    fd = openSync(path, 'r');
  } catch {
    // the plain read names the fault
    return null;
  }
  try {
    size = fstatSync(fd).size;
  } catch {
    closeSync(fd);
    return null;
  }
  const blocks = Math.ceil(size / BLOCK_BYTES);
  if (blocks < 4 || size > maxBytes) {
    closeSync(fd);
    return null;
  }
  const asked = new Map<number, PromiseLike<RowsBlockAnswer | null>>();
  for (let b = blocks - 1; b >= 1; b--) asked.set(b, rowsBlockOf({ path, index: b, blockBytes: BLOCK_BYTES, layerCount }));
  async function* chunks(): AsyncGenerator<Uint8Array | RowsBlockChunk> {
    let pos = 0;
    for (let b = 0; b < blocks; b++) {
      const a = b === 0 ? null : await asked.get(b)!;
      if (a && a.start >= pos && a.end <= size) {
        if (a.start > pos) yield readRange(fd, pos, a.start);
        const { start, end } = a;
        yield { block: a.block, byteLength: end - start, bytes: () => readRange(fd, start, end) };
        pos = end;
        continue;
      }
      const to = Math.min(size, (b + 1) * BLOCK_BYTES);
      if (to > pos) yield readRange(fd, pos, to);
      pos = Math.max(pos, to);
    }
    if (pos < size) yield readRange(fd, pos, size);
  }
  return { chunks: chunks(), close: () => closeSync(fd) };
}
