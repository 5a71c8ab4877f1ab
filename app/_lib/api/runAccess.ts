import 'server-only';
import { z } from 'zod';
import { findRun, type RunHeader } from '@/db/queries/runs';
import { authorizeCaller, type Caller } from '../caller';
import { httpError, httpFailure } from '../errors';

export const idParam = z.coerce.number().int().positive().max(2_147_483_647);

/**
 * For GET routes of one run: the id checked, then the caller (a user who may view runs, or a
 * chamber token of the run's own chamber), then the run. Returns the run or the error answer.
 */
export async function readableRun(request: Request, rawId: string): Promise<{ ok: true; run: RunHeader; caller: Caller } | { ok: false; response: Response }> {
  const id = idParam.safeParse(rawId);
  if (!id.success) return { ok: false, response: httpError('not_found:run') };
  const auth = await authorizeCaller(request, 'viewRuns', true);
  if (!auth.ok) return { ok: false, response: httpFailure(auth) };
  const run = await findRun(id.data);
  if (!run) return { ok: false, response: httpError('not_found:run') };
  if (auth.caller.kind === 'chamber' && run.run.chamberId !== auth.caller.token.chamberId) return { ok: false, response: httpError('forbidden:chamber') };
  return { ok: true, run, caller: auth.caller };
}
