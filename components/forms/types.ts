// Type-only: the result shape is defined once, beside the errors module of app/.
import type { ActionResult } from '@/app/_lib/errors';

export type FormResult<T = undefined> = ActionResult<T>;
export type FormAction<T = undefined> = (prev: ActionResult<T> | null, form: FormData) => Promise<ActionResult<T>>;

export function errorsOf(state: ActionResult<unknown> | null, field: string): string[] | undefined {
  return state && !state.ok ? state.fieldErrors?.[field] : undefined;
}

/** The form-level message, unless it only repeats that fields need attention. */
export function formError(state: ActionResult<unknown> | null): string | null {
  if (!state || state.ok) return null;
  return state.fieldErrors && Object.keys(state.fieldErrors).length ? null : state.message;
}
