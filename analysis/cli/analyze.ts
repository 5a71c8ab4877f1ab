import { createReadStream, statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { isMainThread } from 'node:worker_threads';
import { AnalysisInputError } from '../fit/AnalysisInputError';
import { analyzeRun } from '../fit/analyzeRun';
import { TraceFormatError, type TraceData } from '../trace';
import { readTraceRows, sampleWarningOptions } from '../trace/readTrace';
import { traceWarnings } from '../trace/traceWarnings';
import { isSpectrumThread, serveSpectra, startSpectrumThread } from './spectrumThread';
import { fileChunksWithBlocks, type RowsBlockAnswer, type RowsBlockRequest } from './traceBlocks';
import { choiceFlag, CliInputError, loadDesignFile, parseFlags, requireFlag, runCli } from './args';

const USAGE = 'npm run --silent analyze -- --design FILE --trace FILE [--mode sequential|refit]';

/** The default size limit of readTrace (ReadTraceOptions.maxBytes). */
const MAX_TRACE_BYTES = 200 * 1024 * 1024;

/** The trace without its warnings that read the samples (made by the caller: readTraceRows), its columns shared with the second thread where there is one. */
async function loadTrace(
  path: string, layerCount: number, rowsBlockOf?: (r: RowsBlockRequest) => PromiseLike<RowsBlockAnswer | null>,
): Promise<TraceData> {
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
  // with a second thread, a large file's end is read there meanwhile (cli/traceBlocks.ts)
  const split = rowsBlockOf ? fileChunksWithBlocks(path, layerCount, rowsBlockOf, MAX_TRACE_BYTES) : null;
  try {
    // 1 MiB reads, not the stream's 64 KiB: fewer chunks to join and await (an 18 MB trace read in
    // about 0.07 s less CPU, 4 alternated cold reads each)
    return await readTraceRows(split?.chunks ?? createReadStream(path, { highWaterMark: 1 << 20 }), { fileName: path, layerCount, expectedBytes: size }, !!rowsBlockOf);
  } catch (e) {
    if (e instanceof TraceFormatError) throw new CliInputError(e.message);
    throw e;
  } finally {
    split?.close();
  }
}

/** shared/FORMATS.md `analyze`: { format: "fringelog.analysis/1", layers, warnings, … }. */
export async function analyzeCommand(argv: string[]) {
  const flags = parseFlags(argv, ['design', 'trace', 'mode'], USAGE);
  const designPath = requireFlag(flags, 'design', USAGE);
  const tracePath = requireFlag(flags, 'trace', USAGE);
  const mode = choiceFlag(flags, 'mode', ['sequential', 'refit'] as const, 'sequential');
  const design = loadDesignFile(designPath);
  // started before the trace is read, so the thread is ready when the fits begin; one core: none
  const spectra = availableParallelism() > 1 ? startSpectrumThread(new URL(import.meta.url)) : null;
  try {
    const trace = await loadTrace(tracePath, design.layers.length, spectra?.rowsBlockOf);
    // the trace's warnings that read the samples: on the second thread while this one segments the run
    const warningOptions = sampleWarningOptions({});
    const sampleWarnings = spectra?.sampleWarningsOf({ trace: { timeS: trace.timeS, signal: trace.signal, layer: trace.layer, rowCount: trace.rowCount, headerLine: trace.headerLine }, options: warningOptions });
    if (!sampleWarnings) trace.warnings.push(...traceWarnings(trace, warningOptions));
    const result = await analyzeRun(design, trace, {
      mode, spectrumOf: spectra?.spectrumOf, startDelayProfileOf: spectra?.startDelayProfileOf, wanderPrepOf: spectra?.wanderPrepOf,
      modelResidualsOf: spectra?.modelResidualsOf, runLinesOf: spectra?.runLinesOf, wanderVariancesOf: spectra?.wanderVariancesOf, sampleWarnings,
    }).catch((e: unknown) => {
      if (e instanceof AnalysisInputError) throw new CliInputError(`${tracePath}: ${e.message}`);
      throw e;
    });
    const { format, layers, warnings, ...rest } = result;
    return { format, layers, warnings, ...rest };
  } finally {
    spectra?.close();
  }
}

// (a thread of any other role runs nothing; runCli settles every error itself, so the promise is
// not awaited: the launcher runs the bundle as a script, which has no top-level await)
if (isSpectrumThread) serveSpectra();
else if (isMainThread) void runCli('analyze', analyzeCommand);
