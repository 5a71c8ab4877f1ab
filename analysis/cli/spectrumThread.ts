import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { modelSquaredResiduals, type ModelResidualsRequest } from '../fit/layerResult';
import { runLinesFromRequest, type RunLinesRequest } from '../fit/runDisturbances';
import { layerSpectrum, NO_SPECTRUM, type LayerSpectrum } from '../fit/layerSpectrum';
import { layerSampleWork, type SampleWork, type SampleWorkResult } from '../fit/layerSampleWork';
import { type StartDelayProfile } from '../fit/startDelay';
import { profileFromRequest, type StartDelayProfileRequest } from '../fit/startDelayRequest';
import { type AnalyzeOptions } from '../fit/types';
import { wanderPrepBuffers, wanderPrepFromRequest, type WanderChoiceRequest } from '../fit/wanderChoiceRequest';
import { wanderVariancesFromRequest, type WanderErrorVariance, type WanderVariancesRequest } from '../fit/wanderSigma';
import { type WanderPrep } from '../fit/wanderPrep';
import { type SpectrumLine } from '../trace/fringeSpectrum';
import { rowsBlockBuffers } from '../trace/rowsBlock';
import { traceWarnings } from '../trace/traceWarnings';
import { type TraceData, type TraceWarning } from '../trace/types';
import { rowsBlockFromFile, type RowsBlockAnswer, type RowsBlockRequest } from './traceBlocks';

// The analyze command computes the layers' spectra (and the work on their samples that needs no
// fit, layerSampleWork) on a second thread while the main one fits (AnalyzeOptions.spectrumOf),
// the start delay's profiles while the profiling pass fits on (AnalyzeOptions.startDelayProfileOf),
// the pool-free part of a refit pass's wander choices (AnalyzeOptions.wanderPrepOf), and the
// layers' residuals under their reported models (AnalyzeOptions.modelResidualsOf), the run's
// residual spectrum's lines (AnalyzeOptions.runLinesOf) and each chip's unmodelled-wander
// variances in refit (AnalyzeOptions.wanderVariancesOf): the same
// functions on the same values, so the same figures. Before those, it reads blocks of a large
// trace from the file's end (rowsBlockOf, cli/traceBlocks.ts) while the main one reads from its start,
// then the trace's warnings that read its samples (sampleWarningsOf, the columns on shared memory)
// while the main one segments the run.

type Answer = (LayerSpectrum & Partial<SampleWorkResult>) | (StartDelayProfile | null)[] | WanderPrep | WanderErrorVariance[] | RowsBlockAnswer | TraceWarning[] | SpectrumLine[] | number | null;

/** The trace's warnings that read its samples (traceWarnings), its columns on shared memory. */
export interface SampleWarningsRequest {
  trace: Pick<TraceData, 'timeS' | 'signal' | 'layer' | 'rowCount' | 'headerLine'>;
  options: Parameters<typeof traceWarnings>[1];
}

const ROLE = 'fringelog-layer-spectra';

type Request = { id: number } & ({
  tauS: Float64Array;
  y: Float64Array;
  wavelengthNm: number;
  index: number;
  work?: SampleWork;
} | { profile: StartDelayProfileRequest } | { wander: WanderChoiceRequest } | { rows: RowsBlockRequest } | { sampleWarnings: SampleWarningsRequest }
  | { residuals: ModelResidualsRequest } | { runLines: RunLinesRequest } | { wanderVariances: WanderVariancesRequest });

/**
 * What the thread answers to a request (and this thread, here, when that one cannot): a block of
 * the trace is read there only (here its bytes are read with the rest of the file).
 */
function answer(r: Request, here: boolean): Answer {
  if ('rows' in r) return here ? null : rowsBlockFromFile(r.rows);
  if ('sampleWarnings' in r) return traceWarnings(r.sampleWarnings.trace, r.sampleWarnings.options);
  if ('profile' in r) return profileFromRequest(r.profile);
  if ('wander' in r) return wanderPrepFromRequest(r.wander);
  if ('residuals' in r) return modelSquaredResiduals(r.residuals);
  if ('runLines' in r) return runLinesFromRequest(r.runLines);
  if ('wanderVariances' in r) return wanderVariancesFromRequest(r.wanderVariances);
  const spectrum = r.work?.spectrum === false ? NO_SPECTRUM : layerSpectrum(r.tauS, r.y, r.wavelengthNm, r.index);
  return r.work ? { ...spectrum, ...layerSampleWork(r.tauS, r.y, r.work) } : spectrum;
}

/** True in the thread startSpectrumThread starts (which runs the command's own module). */
export const isSpectrumThread = !isMainThread && (workerData as { role?: string } | null)?.role === ROLE;

/**
 * Who computes each request (by id, while ids fit): 0 nobody yet, 1 the asking thread, 2 this
 * one. A request is computed where it is claimed first (Atomics.compareExchange), so neither
 * thread waits for work the other has not begun: the asking thread claims what it awaits before
 * the thread has reached it (see startSpectrumThread). Either place gives the same figures.
 */
const CLAIMS = 1 << 14;
const HERE = 1, THERE = 2;

/**
 * A thread the launcher (db/local/cli.mjs) started on the command's bundle before loading it,
 * for startSpectrumThread to take over: the same entry, role and claims as its own would have.
 */
const EARLY_THREAD = Symbol.for('fringelog.cli.earlyThread');
interface EarlyThread { entry: string; worker: Worker; claims: Int32Array; failed: boolean }

/** The launcher's thread on `entry` when it has this module's role and claims and has not failed (taken once); else null. */
function takeEarlyThread(entry: URL): EarlyThread | null {
  const g = globalThis as { [EARLY_THREAD]?: EarlyThread };
  const early = g[EARLY_THREAD];
  delete g[EARLY_THREAD];
  if (!early) return null;
  if (early.failed || early.entry !== entry.href || early.claims?.length !== CLAIMS) {
    void early.worker?.terminate();
    return null;
  }
  return early;
}

/**
 * The thread's side: answers each request it claims with layerSpectrum (or the profile or wander
 * prep asked for; a prep's arrays handed over, not copied); one claimed by the asking thread with null.
 */
export function serveSpectra(): void {
  const claims = (workerData as { claims?: Int32Array } | null)?.claims;
  parentPort!.on('message', (r: Request) => {
    const mine = !claims || r.id >= claims.length || Atomics.compareExchange(claims, r.id, 0, THERE) === 0;
    const a = mine ? answer(r, false) : null;
    const buffers = a && 'wander' in r ? wanderPrepBuffers(a as WanderPrep) : a && 'rows' in r && (a as RowsBlockAnswer).block ? rowsBlockBuffers((a as RowsBlockAnswer).block!) : [];
    parentPort!.postMessage({ id: r.id, spectrum: a, skipped: !mine }, buffers);
  });
}

/**
 * Starts a thread on `entry` (the command's own module, which calls serveSpectra there). Any
 * request the thread cannot answer (it failed to start or stopped) is computed here instead.
 */
export function startSpectrumThread(entry: URL): {
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>; startDelayProfileOf: NonNullable<AnalyzeOptions['startDelayProfileOf']>;
  wanderPrepOf: NonNullable<AnalyzeOptions['wanderPrepOf']>; modelResidualsOf: NonNullable<AnalyzeOptions['modelResidualsOf']>;
  runLinesOf: NonNullable<AnalyzeOptions['runLinesOf']>; wanderVariancesOf: NonNullable<AnalyzeOptions['wanderVariancesOf']>; rowsBlockOf: (r: RowsBlockRequest) => PromiseLike<RowsBlockAnswer | null>;
  sampleWarningsOf: (r: SampleWarningsRequest) => PromiseLike<TraceWarning[]>; close: () => void;
} {
  const pending = new Map<number, { request: Request; resolve: (s: Answer) => void }>();
  const local = (r: Request) => answer(r, true);
  const early = takeEarlyThread(entry);
  const claims = early?.claims ?? new Int32Array(new SharedArrayBuffer(4 * CLAIMS));
  let worker: Worker | null = null;
  let closed = false;
  const fail = () => {
    worker = null;
    if (closed) return;
    for (const p of pending.values()) p.resolve(local(p.request));
    pending.clear();
  };
  try {
    worker = early?.worker ?? new Worker(entry, { workerData: { role: ROLE, claims } });
    worker.unref();
    worker.on('message', (m: { id: number; spectrum: Answer; skipped?: boolean }) => {
      // a request this thread claimed was answered here already
      if (!m.skipped) pending.get(m.id)?.resolve(m.spectrum);
      pending.delete(m.id);
    });
    worker.on('error', fail);
    worker.on('exit', fail);
  } catch {
    worker = null;
  }
  let next = 0;
  // What ask returns: a promise that, once awaited (its then called) before the thread has begun
  // the request, claims it and computes it here, so this thread does not wait idle for work
  // queued behind the thread's (the thread then skips it).
  const ask = (request: Request): Promise<Answer> => {
    if (!worker) return Promise.resolve(local(request));
    const w = worker;
    let settle!: (s: Answer) => void;
    const answered = new Promise<Answer>((resolve) => (settle = resolve));
    pending.set(request.id, { request, resolve: settle });
    w.postMessage(request);
    const claim = () => {
      if (request.id < claims.length && pending.has(request.id) && Atomics.compareExchange(claims, request.id, 0, HERE) === 0) {
        pending.delete(request.id);
        settle(local(request));
      }
    };
    return {
      then: (onFulfilled, onRejected) => {
        claim();
        return answered.then(onFulfilled, onRejected);
      },
      catch: (onRejected) => answered.catch(onRejected),
      finally: (onFinally) => answered.finally(onFinally),
      [Symbol.toStringTag]: 'Promise',
    } as Promise<Answer>;
  };
  return {
    spectrumOf: (tauS, y, wavelengthNm, index, work) =>
      ask({ id: next++, tauS, y, wavelengthNm, index, ...(work ? { work } : {}) }) as Promise<LayerSpectrum & Partial<SampleWorkResult>>,
    startDelayProfileOf: (profile) => ask({ id: next++, profile }) as Promise<(StartDelayProfile | null)[]>,
    wanderPrepOf: (wander) => ask({ id: next++, wander }) as Promise<WanderPrep>,
    modelResidualsOf: (residuals) => ask({ id: next++, residuals }) as Promise<number>,
    runLinesOf: (runLines) => ask({ id: next++, runLines }) as Promise<SpectrumLine[]>,
    wanderVariancesOf: (wanderVariances) => ask({ id: next++, wanderVariances }) as Promise<WanderErrorVariance[] | null>,
    rowsBlockOf: (rows) => ask({ id: next++, rows }) as Promise<RowsBlockAnswer | null>,
    sampleWarningsOf: (sampleWarnings) => ask({ id: next++, sampleWarnings }) as Promise<TraceWarning[]>,
    close: () => {
      // the analysis is over (done, or failed): nothing pending is wanted any more
      closed = true;
      pending.clear();
      const w = worker;
      worker = null;
      void w?.terminate();
    },
  };
}
