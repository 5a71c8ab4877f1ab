import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { layerSpectrum, NO_SPECTRUM, type LayerSpectrum } from '../fit/layerSpectrum';
import { layerSampleWork, type SampleWork, type SampleWorkResult } from '../fit/layerSampleWork';
import { type StartDelayProfile } from '../fit/startDelay';
import { profileFromRequest, type StartDelayProfileRequest } from '../fit/startDelayRequest';
import { type AnalyzeOptions } from '../fit/types';

// The analyze command computes the layers' spectra (and the work on their samples that needs no
// fit, layerSampleWork) on a second thread while the main one fits (AnalyzeOptions.spectrumOf),
// and the start delay's profiles while the profiling pass fits on (AnalyzeOptions.startDelayProfileOf):
// the same functions on the same values, so the same figures.

type Answer = (LayerSpectrum & Partial<SampleWorkResult>) | StartDelayProfile | null;

const ROLE = 'fringelog-layer-spectra';

type Request = { id: number } & ({
  tauS: Float64Array;
  y: Float64Array;
  wavelengthNm: number;
  index: number;
  work?: SampleWork;
} | { profile: StartDelayProfileRequest });

/** What the thread answers to a request (and this thread, when that one cannot). */
function answer(r: Request): Answer {
  if ('profile' in r) return profileFromRequest(r.profile);
  const spectrum = r.work?.spectrum === false ? NO_SPECTRUM : layerSpectrum(r.tauS, r.y, r.wavelengthNm, r.index);
  return r.work ? { ...spectrum, ...layerSampleWork(r.tauS, r.y, r.work) } : spectrum;
}

/** True in the thread startSpectrumThread starts (which runs the command's own module). */
export const isSpectrumThread = !isMainThread && (workerData as { role?: string } | null)?.role === ROLE;

/** The thread's side: answers each request with layerSpectrum. */
export function serveSpectra(): void {
  parentPort!.on('message', (r: Request) => {
    parentPort!.postMessage({ id: r.id, spectrum: answer(r) });
  });
}

/**
 * Starts a thread on `entry` (the command's own module, which calls serveSpectra there). Any
 * request the thread cannot answer (it failed to start or stopped) is computed here instead.
 */
export function startSpectrumThread(entry: URL): {
  spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>; startDelayProfileOf: NonNullable<AnalyzeOptions['startDelayProfileOf']>; close: () => void;
} {
  const pending = new Map<number, { request: Request; resolve: (s: Answer) => void }>();
  const local = answer;
  let worker: Worker | null = null;
  let closed = false;
  const fail = () => {
    worker = null;
    if (closed) return;
    for (const p of pending.values()) p.resolve(local(p.request));
    pending.clear();
  };
  try {
    worker = new Worker(entry, { workerData: { role: ROLE } });
    worker.unref();
    worker.on('message', (m: { id: number; spectrum: Answer }) => {
      pending.get(m.id)?.resolve(m.spectrum);
      pending.delete(m.id);
    });
    worker.on('error', fail);
    worker.on('exit', fail);
  } catch {
    worker = null;
  }
  let next = 0;
  const ask = (request: Request): Promise<Answer> => {
    if (!worker) return Promise.resolve(local(request));
    const w = worker;
    return new Promise((resolve) => {
      pending.set(request.id, { request, resolve });
      w.postMessage(request);
    });
  };
  return {
    spectrumOf: (tauS, y, wavelengthNm, index, work) =>
      ask({ id: next++, tauS, y, wavelengthNm, index, ...(work ? { work } : {}) }) as Promise<LayerSpectrum & Partial<SampleWorkResult>>,
    startDelayProfileOf: (profile) => ask({ id: next++, profile }) as Promise<StartDelayProfile | null>,
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
