import { z } from 'zod';

/** Known failure codes, `kind:subject`, with their HTTP status and a message safe to show. */
export const errorCodes = {
  'unauthorized:session': { status: 401, message: 'Your session has ended. Sign in again.' },
  'forbidden:role': { status: 403, message: 'Your role does not allow this.' },
  'bad_request:input': { status: 400, message: 'Check the highlighted fields.' },
  'not_found:user': { status: 404, message: 'No such user.' },
  'not_found:run': { status: 404, message: 'No such run.' },
  'not_found:note': { status: 404, message: 'No such note of yours on this run.' },
  'bad_request:design': { status: 422, message: 'The design does not follow fringelog.design/1.' },
  'bad_request:json': { status: 400, message: 'The request body is not valid JSON.' },
  'too_large:body': { status: 413, message: 'The request body is too large.' },
  'not_found:design': { status: 404, message: 'No such design or revision.' },
  'not_found:material': { status: 404, message: 'No such material.' },
  'conflict:material_name': { status: 409, message: 'That name is already taken by another material.' },
  'conflict:last_admin': { status: 409, message: 'This is the last active administrator; make another admin first.' },
  'rate_limited:sign_in': { status: 429, message: 'Too many failed sign-ins.' },
  'unavailable:mail': { status: 503, message: 'The e-mail could not be sent.' },
  'unauthorized:token': { status: 401, message: 'The chamber token is not valid (unknown or revoked).' },
  'forbidden:chamber': { status: 403, message: 'This chamber token is for another chamber.' },
  'not_found:analysis': { status: 404, message: 'No such analysis.' },
  'not_found:token': { status: 404, message: 'No such chamber token, or it is already revoked.' },
  'conflict:run_code': { status: 409, message: 'This run code is already used in this chamber.' },
  'too_large:upload': { status: 413, message: 'The file is larger than the upload limit.' },
  'unsupported_media_type:upload': { status: 415, message: 'Send the trace as multipart/form-data with a file field named "trace".' },
  'unprocessable:field': { status: 422, message: 'A field of the upload is missing or unknown.' },
  'unprocessable:trace': { status: 422, message: 'The trace file is not valid.' },
  'internal:unexpected': { status: 500, message: 'Something went wrong on our side. It has been logged.' },
} as const;
export type ErrorCode = keyof typeof errorCodes;

export type FieldErrors = Record<string, string[] | undefined>;
export type ActionResult<T = undefined> =
  | { ok: true; data: T }
  | { ok: false; code: ErrorCode; message: string; fieldErrors?: FieldErrors };

export function ok<T>(data: T): ActionResult<T> {
  return { ok: true, data };
}

export function failure(code: ErrorCode, message?: string, fieldErrors?: FieldErrors): { ok: false; code: ErrorCode; message: string; fieldErrors?: FieldErrors } {
  return { ok: false, code, message: message ?? errorCodes[code].message, ...(fieldErrors ? { fieldErrors } : {}) };
}

export function fieldFailure(field: string, message: string): ReturnType<typeof failure> {
  return failure('bad_request:input', message, { [field]: [message] });
}

export function fromZod(error: z.ZodError): ReturnType<typeof failure> {
  const flat = z.flattenError(error);
  const first = flat.formErrors[0];
  return failure('bad_request:input', first ?? errorCodes['bad_request:input'].message, flat.fieldErrors as FieldErrors);
}

/** Logs an unexpected error in full and returns the generic result. */
export function unexpected(context: string, err: unknown): ReturnType<typeof failure> {
  console.error(`[fringelog] ${context}:`, err);
  return failure('internal:unexpected');
}

/** Where a refusal points: `line`/`column` in an uploaded file (column 1-based), or a form `field`. */
export type ErrorPlace = { line?: number; column?: number; columnName?: string; field?: string };

/** The HTTP API's error answer (shared/FORMATS.md): `{ error: { code, message, line?, column? } }`. */
export function httpError(code: ErrorCode, detail?: string, place: ErrorPlace = {}): Response {
  const { status, message } = errorCodes[code];
  const defined = Object.fromEntries(Object.entries(place).filter(([, v]) => v !== undefined));
  return Response.json({ error: { code, message: detail ?? message, ...defined } }, { status });
}

/** A failure result (from authorize, a zod check) as the HTTP API's error answer. */
export function httpFailure(f: { code: ErrorCode; message: string }): Response {
  return httpError(f.code, f.message);
}

/**
 * For an action called with something other than FormData (anyone can post any arguments to a
 * server action): a 400 result instead of a TypeError. Every action checks `form instanceof
 * FormData` first and returns this.
 */
export function notAForm(): ReturnType<typeof failure> {
  return failure('bad_request:input', 'This request did not come from the form.');
}

/** Reads a FormData into a plain object of strings, for zod. */
export function formObject(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === 'string') out[k] = v;
  return out;
}
