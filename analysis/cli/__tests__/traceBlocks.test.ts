import { createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readTrace, TraceFormatError, type TraceData } from '../../trace';
import { BLOCK_BYTES, fileChunksWithBlocks, rowsBlockFromFile, type RowsBlockRequest } from '../traceBlocks';

// The analyze command's read of a large trace on two threads (the file's end in blocks there,
// its start here) against the plain read of the same file: the same trace, the same fault.

const dir = mkdtempSync(path.join(tmpdir(), 'fringelog-blocks-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function traceText(rows: number, edit?: (i: number, line: string) => string): string {
  const out = ['# chamber: Bay 3', 'time_s,signal,layer,chip'];
  for (let i = 0; i < rows; i++) {
    const line = `${(i * 0.01).toFixed(2)},${(0.9 + 0.05 * Math.sin(i / 50)).toFixed(6)},${Math.floor(i / 50000)},${1 + (Math.floor(i / 50000) % 3)}`;
    out.push(edit ? edit(i, line) : line);
  }
  return out.join('\n') + '\n';
}

async function read(chunks: Parameters<typeof readTrace>[0]): Promise<TraceData | string> {
  try {
    return await readTrace(chunks, { fileName: 'run.csv', layerCount: 10 });
  } catch (e) {
    if (e instanceof TraceFormatError) return e.message;
    throw e;
  }
}

/** Plain read, and the read in blocks where `there(index)` says which blocks the other thread read. */
async function both(name: string, text: string, there: (index: number) => boolean) {
  const file = path.join(dir, name);
  writeFileSync(file, text);
  const plain = await read(createReadStream(file, { highWaterMark: 1 << 20 }));
  const asked: number[] = [];
  const split = fileChunksWithBlocks(file, 10, async (r: RowsBlockRequest) => {
    asked.push(r.index);
    return there(r.index) ? rowsBlockFromFile(r) : null;
  }, 200 * 1024 * 1024);
  expect(split).not.toBeNull();
  // the blocks read there that were not appended but read from their bytes
  let fromBytes = 0;
  async function* counted() {
    for await (const c of split!.chunks) {
      if (c instanceof Uint8Array || !c.block) yield c;
      else yield { ...c, bytes: () => (fromBytes++, c.bytes()) };
    }
  }
  try {
    return { plain, split: await read(counted()), asked, fromBytes };
  } finally {
    split!.close();
  }
}

describe('the analyze command reads a large trace in blocks on two threads', () => {
  const rows = 400_000; // about 8 MB: 8 blocks

  it('the same trace, the other thread reading the last blocks, asked for from the end', async () => {
    const { plain, split, asked, fromBytes } = await both('ok.csv', traceText(rows), (b) => b >= 4);
    expect(asked[0]).toBeGreaterThanOrEqual(6);
    expect(asked).toEqual(Array.from({ length: asked[0] }, (_, k) => asked[0] - k));
    expect(fromBytes).toBe(0);
    expect(typeof plain).toBe('object');
    expect(split).toEqual(plain);
    expect((plain as TraceData).rowCount).toBe(rows);
  });

  it('reads a block from its bytes where the other thread read it but it does not follow on (time going back at its first line)', async () => {
    const text = traceText(rows);
    // the first line starting in block 5
    const at = text.indexOf('\n', 5 * BLOCK_BYTES - 1) + 1;
    const line = text.slice(0, at).split('\n').length;
    const i = line - 3; // the row on that line
    const back = traceText(rows, (k, l) => (k === i ? `${((i - 2) * 0.01).toFixed(2)}${l.slice(l.indexOf(','))}` : l));
    const { plain, split, fromBytes } = await both('back.csv', back, (b) => b >= 4);
    expect(fromBytes).toBe(1);
    expect(plain).toBe(`run.csv line ${line}, column "time_s": ${((i - 2) * 0.01).toFixed(2)} is not after the previous time ${((i - 1) * 0.01).toFixed(2)} (line ${line - 1}); time must be strictly increasing`);
    expect(split).toBe(plain);
  });

  it('a bad value at the end of a block and a layer beyond the design in the last: the same first fault', async () => {
    const text = traceText(rows);
    const at = text.indexOf('\n', 6 * BLOCK_BYTES - 1) + 1;
    const i = text.slice(0, at).split('\n').length - 4; // the last row of block 5
    for (const edit of [(k: number, l: string) => (k === i ? l.replace(/,1$|,2$|,3$/, ',x') : l), (k: number, l: string) => (k === rows - 1 ? l.replace(/,\d+,(\d)$/, ',11,$1') : l)]) {
      const { plain, split } = await both('bad.csv', traceText(rows, edit), (b) => b >= 3);
      expect(typeof plain).toBe('string');
      expect(split).toBe(plain);
    }
  });

  it('leaves a small file to the plain read', () => {
    const file = path.join(dir, 'small.csv');
    writeFileSync(file, traceText(1000));
    expect(fileChunksWithBlocks(file, 10, async () => null, 200 * 1024 * 1024)).toBeNull();
  });
});
