import { sql, type SQL } from 'drizzle-orm';

/**
 * The openings of the analysis's notes (what it did, not what needs a look), as
 * analysis/fit/analysisNotes.ts gives them: here for the run list's SQL (db/ imports analysis/
 * for types only); db/queries/__tests__/runNotes.test.ts keeps the two lists equal. A run's notes
 * neither count as warnings nor flag it.
 */
export const NOTE_OPENINGS: readonly string[] = ['start transient:', 'lamp ripple divided out:', 'lamp drift assumed:'];

/** The number of `column`'s messages (a jsonb array of strings) that are warnings, not notes. */
export function warningCountSql(column: SQL): SQL {
  const notNote = sql.join(NOTE_OPENINGS.map((o) => sql`left(m.text, ${o.length}) <> ${o}`), sql` and `);
  return sql`(select count(*) from jsonb_array_elements_text(${column}) as m(text) where ${notNote})`;
}
