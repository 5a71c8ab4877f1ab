import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { layerSpectrum, type LayerSpectrum } from '../fit/layerSpectrum';
import { type AnalyzeOptions } from '../fit/types';

// The analyze command computes the layers' spectra on a second thread while the main one fits
// (AnalyzeOptions.spectrumOf): the same function on the same samples, so the same figures.

const ROLE = 'fringelog-layer-spectra';

interface Request {
  id: number;
  tauS: Float64Array;
  y: Float64Array;
  wavelengthNm: number;
  index: number;
}

/** True in the thread startSpectrumThread starts (which runs the command's own module). */
export const isSpectrumThread = !isMainThread && (workerData as { role?: string } | null)?.role === ROLE;

/** The thread's side: answers each request with layerSpectrum. */
export function serveSpectra(): void {
  parentPort!.on('message', (r: Request) => {
    parentPort!.postMessage({ id: r.id, spectrum: layerSpectrum(r.tauS, r.y, r.wavelengthNm, r.index) });
  });
}

/**
 * Starts a thread on `entry` (the command's own module, which calls serveSpectra there). Any
 * request the thread cannot answer (it failed to start or stopped) is computed here instead.
 */
export function startSpectrumThread(entry: URL): { spectrumOf: NonNullable<AnalyzeOptions['spectrumOf']>; close: () => void } {
  const pending = new Map<number, { request: Request; resolve: (s: LayerSpectrum) => void }>();
  const local = (r: Request) => layerSpectrum(r.tauS, r.y, r.wavelengthNm, r.index);
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
    worker.on('message', (m: { id: number; spectrum: LayerSpectrum }) => {
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
    spectrumOf: (tauS, y, wavelengthNm, index) => {
      const request = { id: next++, tauS, y, wavelengthNm, index };
      if (!worker) return Promise.resolve(local(request));
      const w = worker;
      return new Promise((resolve) => {
        pending.set(request.id, { request, resolve });
        w.postMessage(request);
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
