import type { ApiError } from '@/components/query/fetchJson';
import type { UploadForm } from './traceHeader';

export type UploadAnswer =
  | { ok: true; run: { id: string; url: string; runCode?: string }; analyses: { id: string; mode: 'sequential' | 'refit'; state: string }[] }
  | { ok: false; status: number; error: ApiError };

/**
 * POSTs one trace to /api/runs with XMLHttpRequest, whose upload events give the progress bar
 * (fetch has none). The fields go before the file, so the server knows them when the file arrives.
 */
export function sendUpload(file: File, form: UploadForm, onProgress: (fraction: number) => void): Promise<UploadAnswer> {
  const body = new FormData();
  for (const [k, v] of Object.entries(form)) if (v.trim()) body.set(k, v.trim());
  body.set('trace', file, file.name);
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/runs');
    xhr.responseType = 'json';
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const answer = xhr.response as Record<string, unknown> | null;
      if (xhr.status === 201 && answer) resolve({ ok: true, ...(answer as Omit<Extract<UploadAnswer, { ok: true }>, 'ok'>) });
      else resolve({ ok: false, status: xhr.status, error: (answer?.error as ApiError | undefined) ?? { code: 'http', message: `The server answered ${xhr.status}.` } });
    };
    xhr.onerror = () => resolve({ ok: false, status: 0, error: { code: 'network', message: 'The upload did not reach the server (network error).' } });
    xhr.send(body);
  });
}
