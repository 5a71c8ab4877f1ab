import { closeSync, createReadStream, openSync, readSync, statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { AnalysisInputError } from '../fit/AnalysisInputError';
import { analyzeRun } from '../fit/analyzeRun';
import { joinTraceParts, readTrace, readTraceBytes, readTraceHead, readTraceTail, splitTrace, TraceFormatError, type TraceData } from '../trace';
import { isSpectrumThread, serveSpectra, startSpectrumThread } from './spectrumThread';
import { choiceFlag, CliInputError, loadDesignFile, parseFlags, requireFlag, runCli } from './args';

const USAGE = 'npm run --silent analyze -- --design FILE --trace FILE [--mode sequential|refit]';

type Spectra = ReturnType<typeof startSpectrumThread>;

/**
 * A larger file is streamed on one thread as before: a split read holds the whole file in memory,
 * and memory should stay bounded by the samples, not by the file (a file of comment lines).
 */
const SPLIT_MAX_BYTES = 64 * 1024 * 1024;

/**
 * The share of the file read here: the other thread starts reading only once it has loaded the
 * command's module (about 0.1–0.15 s after this one posts the tail, on the bench's 17 MB trace
 * where a whole read takes about 0.45 s), so it gets the smaller part.
 */
const HEAD_FRACTION = 0.68;

/**
 * The file read on two threads: its first part here, the rest on the spectrum thread (in memory
 * shared by both), joined as one read of the whole would give; the whole read here where the
 * file is small, not split cleanly, or the join could differ (a fault in the second part).
 */
async function readSplit(path: string, size: number, options: { fileName: string; layerCount: number }, spectra: Spectra): Promise<TraceData> {
  const shared = new SharedArrayBuffer(size);
  const bytes = new Uint8Array(shared);
  const fd = openSync(path, 'r');
  let length = 0;
  try {
    for (let n = -1; n !== 0 && length < size; length += n) n = readSync(fd, bytes, length, size - length, length);
  } finally {
    closeSync(fd);
  }
  const whole = bytes.subarray(0, length);
  const split = splitTrace(whole, { fraction: HEAD_FRACTION });
  if (!split) return readTraceBytes(whole, options);
  const tail = spectra.traceTail(shared, length, split, options);
  const head = await readTraceHead(whole, split, options);
  // the thread stopped or never started: the tail read here (a fault in it, and the whole is read)
  const answer = await tail;
  const rest = answer !== undefined ? answer : head ? await readTraceTail(whole, split, options).catch(() => null) : null;
  return (head && rest ? joinTraceParts(head, rest, options) : null) ?? readTraceBytes(whole, options);
}

async function loadTrace(path: string, layerCount: number, spectra: Spectra | null): Promise<TraceData> {
  let size = 0;
  try {
    const stat = statSync(path);
    if (!stat.isFile()) throw new CliInputError(`${path}: cannot read file: is a directory`);
    size = stat.size;
  } catch (e) {
    if (e instanceof CliInputError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new CliInputError(`${path}: cannot read file: ${code === 'ENOENT' ? 'no such file' : (e as Error).message}`);
  }
  try {
    const split = spectra && size <= SPLIT_MAX_BYTES ? await readSplit(path, size, { fileName: path, layerCount }, spectra) : null;
    return split ?? (await readTrace(createReadStream(path), { fileName: path, layerCount }));
  } catch (e) {
    if (e instanceof TraceFormatError) throw new CliInputError(e.message);
    throw e;
  }
}

/** shared/FORMATS.md `analyze`: { format: "fringelog.analysis/1", layers, warnings, … }. */
export async function analyzeCommand(argv: string[]) {
  const flags = parseFlags(argv, ['design', 'trace', 'mode'], USAGE);
  const designPath = requireFlag(flags, 'design', USAGE);
  const tracePath = requireFlag(flags, 'trace', USAGE);
  const mode = choiceFlag(flags, 'mode', ['sequential', 'refit'] as const, 'sequential');
  // started first, so the thread is ready to read its part of the trace as soon as it can; one core: none
  const spectra = availableParallelism() > 1 ? startSpectrumThread(new URL(import.meta.url)) : null;
  try {
    const design = loadDesignFile(designPath);
    const trace = await loadTrace(tracePath, design.layers.length, spectra);
    const result = await analyzeRun(design, trace, { mode, spectrumOf: spectra?.spectrumOf }).catch((e: unknown) => {
      if (e instanceof AnalysisInputError) throw new CliInputError(`${tracePath}: ${e.message}`);
      throw e;
    });
    const { format, layers, warnings, ...rest } = result;
    return { format, layers, warnings, ...rest };
  } finally {
    spectra?.close();
  }
}

if (isSpectrumThread) serveSpectra();
else await runCli('analyze', analyzeCommand);
