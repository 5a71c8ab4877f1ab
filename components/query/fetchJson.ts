/** The API's error shape (shared/FORMATS.md). */
export type ApiError = { code: string; message: string; line?: number; column?: number; columnName?: string; field?: string };

export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    readonly error: ApiError,
  ) {
    super(error.message);
  }
}

/** GET a JSON route of our own API; a non-2xx answer throws ApiFailure with the route's message. */
export async function fetchJson<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: 'application/json' }, cache: 'no-store' });
  const body: unknown = await res.json().catch(() => null);
  if (!res.ok) {
    const error = (body as { error?: ApiError } | null)?.error ?? { code: 'http', message: `${res.status} ${res.statusText}` };
    throw new ApiFailure(res.status, error);
  }
  return body as T;
}
