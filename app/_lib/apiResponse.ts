import 'server-only';
import { errorCodes, type ErrorCode, type FieldErrors } from './errors';

/**
 * The HTTP API's error answer (shared/FORMATS.md): `{ "error": { "code", "message" } }`, plus
 * `key` (the design or material key at fault) and `fieldErrors` where there are any.
 */
export function apiError(failure: { code: ErrorCode; message: string; fieldErrors?: FieldErrors }): Response {
  const keys = failure.fieldErrors ? Object.keys(failure.fieldErrors) : [];
  const body = { code: failure.code, message: failure.message, ...(keys.length ? { key: keys[0], fieldErrors: failure.fieldErrors } : {}) };
  return Response.json({ error: body }, { status: errorCodes[failure.code].status });
}

/** Largest JSON body a design or material handler reads (a 200-layer design is ~40 kB). */
export const MAX_JSON_BYTES = 2 * 1024 * 1024;

/** Reads a JSON request body within MAX_JSON_BYTES; a result, never an exception. */
export async function readJsonBody(request: Request): Promise<{ ok: true; value: unknown } | { ok: false; code: ErrorCode; message: string }> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > MAX_JSON_BYTES) return { ok: false, code: 'too_large:body', message: `The body is larger than ${MAX_JSON_BYTES / 1024 / 1024} MB.` };
  const text = await request.text();
  if (Buffer.byteLength(text) > MAX_JSON_BYTES) return { ok: false, code: 'too_large:body', message: `The body is larger than ${MAX_JSON_BYTES / 1024 / 1024} MB.` };
  try {
    return { ok: true, value: JSON.parse(text) as unknown };
  } catch (e) {
    return { ok: false, code: 'bad_request:json', message: `The body is not valid JSON: ${(e as Error).message}` };
  }
}
