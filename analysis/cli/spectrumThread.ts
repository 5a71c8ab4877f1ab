import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { layerSpectrum, type LayerSpectrum } from '../fit/layerSpectrum';
import { layerSampleWork, type SampleWork, type SampleWorkResult } from '../fit/layerSampleWork';
import { type AnalyzeOptions } from '../fit/types';
import { readTraceTail, TraceFormatError, type ReadTraceOptions, type TracePart, type TraceSplit } from '../trace';

// The analyze command computes the layers' spectra (and the work on their samples that needs no
// fit, layerSampleWork) on a second thread while the main one fits (AnalyzeOptions.spectrumOf):
// the same functions on the same samples, so the same figures.

type Answer = LayerSpectrum & Partial<SampleWorkResult>;

const ROLE = 'fringelog-layer-spectra';

interface Request {
  id: number;
  tauS: Float64Array;
  y: Float64Array;
  wavelengthNm: number;
  index: number;
  work?: SampleWork;
}

/** What the thread answers to a request (and this thread, when that one cannot). */
function answer(r: Request): Answer {
  const spectrum = layerSpectrum(r.tauS, r.y, r.wavelengthNm, r.index);
  return r.work ? { ...spectrum, ...layerSampleWork(r.tauS, r.y, r.work) } : spectrum;
}

/** True in the thread startSpectrumThread starts (which runs the command's own module). */
export const isSpectrumThread = !isMainThread && (workerData as { role?: string } | null)?.role === ROLE;

/** The second half of the trace file, to be read there while this thread reads the first (readTraceParts.ts). */
interface TailRequest {
  id: number;
  tail: { bytes: SharedArrayBuffer; length: number; split: TraceSplit; options: ReadTraceOptions };
}

/** The tail's part, its arrays handed over (not copied); null on a fault in it (the caller then reads the whole file, for the first fault). */
async function readTail(r: TailRequest['tail']): Promise<{ part: TracePart | null; transfer: ArrayBuffer[] }> {
  try {
    const part = await readTraceTail(new Uint8Array(r.bytes, 0, r.length), r.split, r.options);
    const arrays = [part.timeS, part.signal, part.layer, part.chip, part.crystalNm];
    return { part, transfer: arrays.flatMap((a) => (a ? [a.buffer as ArrayBuffer] : [])) };
  } catch (e) {
    if (e instanceof TraceFormatError) return { part: null, transfer: [] };
    throw e;
  }
}

/** The thread's side: answers each request with layerSpectrum, or with the trace's tail read. */
export function serveSpectra(): void {
  parentPort!.on('message', (r: Request | TailRequest) => {
    if ('tail' in r) {
      void readTail(r.tail).then(({ part, transfer }) => parentPort!.postMessage({ id: r.id, tail: part }, transfer));
      return;
    }
    parentPort!.postMessage({ id: r.id, spectrum: answer(r) });
  });
}

/**
 * Starts a thread on `entry` (the command's own module, which calls serveSpectra there). Any
 * request the thread cannot answer (it failed to start or stopped) is computed here instead.
 */
export function startSpectrumThread(entry: URL): {
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>;
  /** The trace's tail read there; null on a fault in it, undefined when the thread is not there to read it. */
  traceTail: (bytes: SharedArrayBuffer, length: number, split: TraceSplit, options: ReadTraceOptions) => Promise<TracePart | null | undefined>;
  close: () => void;
} {
  const pending = new Map<number, { request: Request; resolve: (s: Answer) => void }>();
  const tails = new Map<number, (part: TracePart | null | undefined) => void>();
  const local = answer;
  let worker: Worker | null = null;
  let closed = false;
  const fail = () => {
    worker = null;
    if (closed) return;
    for (const p of pending.values()) p.resolve(local(p.request));
    pending.clear();
    for (const t of tails.values()) t(undefined);
    tails.clear();
  };
  try {
    worker = new Worker(entry, { workerData: { role: ROLE } });
    worker.unref();
    worker.on('message', (m: { id: number; spectrum: Answer } | { id: number; tail: TracePart | null }) => {
      if ('tail' in m) {
        tails.get(m.id)?.(m.tail);
        tails.delete(m.id);
        return;
      }
      pending.get(m.id)?.resolve(m.spectrum);
      pending.delete(m.id);
    });
    worker.on('error', fail);
    worker.on('exit', fail);
  } catch {
    worker = null;
  }
  let next = 0;
  return {
    spectrumOf: (tauS, y, wavelengthNm, index, work) => {
      const request: Request = { id: next++, tauS, y, wavelengthNm, index, ...(work ? { work } : {}) };
      if (!worker) return Promise.resolve(local(request));
      const w = worker;
      return new Promise((resolve) => {
        pending.set(request.id, { request, resolve });
        w.postMessage(request);
      });
    },
    traceTail: (bytes, length, split, options) => {
      if (!worker) return Promise.resolve(undefined);
      const w = worker;
      const id = next++;
      return new Promise((resolve) => {
        tails.set(id, resolve);
        w.postMessage({ id, tail: { bytes, length, split, options } } satisfies TailRequest);
      });
    },
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
