/**
 * The analysis's messages that say what it did, not what needs a look: a start-up delay found or
 * not and how the fits took it (startDelaySigma.ts startDelayNote), a lamp ripple read and divided
 * out (analyzeRun.ts withRippleDivided), a held lamp drift whose assumed stability makes up most of
 * some layers' σ (lampDriftNote.ts). They go out among the result's `warnings` (the format has
 * one list), and the product lists them apart: they neither count as warnings nor flag the run
 * (db/queries/runNotes.ts holds the same openings for its SQL; its test keeps the two equal).
 */
export const NOTE_OPENINGS: readonly string[] = ['start transient:', 'lamp ripple divided out:', 'lamp drift assumed:'];

export function isAnalysisNote(message: string): boolean {
  return NOTE_OPENINGS.some((o) => message.startsWith(o));
}

/** How many of an analysis's messages are warnings (not notes). */
export function warningCount(messages: readonly string[]): number {
  return messages.filter((m) => !isAnalysisNote(m)).length;
}

/** "1 warning", "3 warnings": an analysis's warnings counted in words, its notes left out. */
export function warningsInWords(messages: readonly string[]): string {
  const n = warningCount(messages);
  return `${n} warning${n === 1 ? '' : 's'}`;
}
