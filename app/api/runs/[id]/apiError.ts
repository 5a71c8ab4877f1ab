import 'server-only';
import { errorCodes, type ErrorCode } from '@/app/_lib/errors';

/** An error answer in the shape of shared/FORMATS.md: { error: { code, message } } with the code's status. */
export function apiError(code: ErrorCode, message?: string): Response {
  const { status, message: safe } = errorCodes[code];
  return Response.json({ error: { code, message: message ?? safe } }, { status });
}
