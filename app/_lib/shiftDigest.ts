import 'server-only';
import { analysisAlert, type RuleAlert } from '@/db/jobs/analysisAlert';
import type { ShiftWindow } from '@/db/jobs/shifts';
import { alertRecipients } from '@/db/queries/alerts';
import { shiftDigestRuns, type DigestRun } from '@/db/queries/shiftDigest';
import { roles } from '@/db/schema';
import { can } from './capabilities';
import { appLink, sendMail } from './mail';

export type DigestEntry = DigestRun & { controlRules: RuleAlert[] };

const dispositionText = { accepted: 'accepted', on_hold: 'on hold', rejected: 'rejected' } as const;
const figureText = { thickness: 'thickness', index: 'index', cut: 'cut' } as const;

const stamp = (d: Date) => `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;

/** The runs of a shift window with their flags, control-chart rules included (analysisAlert's chart of each run). */
export async function shiftDigestEntries(window: ShiftWindow): Promise<DigestEntry[]> {
  const runs = await shiftDigestRuns(window.from, window.to);
  const out: DigestEntry[] = [];
  for (const run of runs) {
    const alert = run.analysisId === null ? undefined : await analysisAlert(run.analysisId);
    out.push({ ...run, controlRules: alert?.controlRules ?? [] });
  }
  return out;
}

function flagged(e: DigestEntry): boolean {
  return e.layersOut.length > 0 || e.controlRules.length > 0 || e.failed.length > 0;
}

/** The digest e-mail: one paragraph a run, flagged runs first, each with a link to the run. */
export function shiftDigestMail(window: ShiftWindow, entries: DigestEntry[], name: string): { subject: string; text: string } {
  const flaggedCount = entries.filter(flagged).length;
  const lines = [
    `Hello ${name},`, '',
    `The ${window.shift} shift, ${stamp(window.from)} to ${stamp(window.to)}: ${entries.length} run${entries.length === 1 ? '' : 's'} started or analysed, ${flaggedCount} flagged.`, '',
  ];
  const ordered = [...entries.filter(flagged), ...entries.filter((e) => !flagged(e))];
  for (const e of ordered) {
    lines.push(`${flagged(e) ? '[flagged] ' : ''}Run ${e.runCode}: ${e.designName} rev. ${e.revision}, ${e.chamberName}, shift ${e.shift ?? '–'}, operator ${e.operatorName ?? '–'}${e.startedAt ? `, started ${stamp(e.startedAt)}` : ''}`);
    lines.push(`  disposition: ${e.disposition ? dispositionText[e.disposition] : 'none yet'}`);
    if (e.analysisId === null) lines.push('  no finished analysis');
    else if (e.worstCut) lines.push(`  worst cut error: layer ${e.worstCut.layer}, ${e.worstCut.value.toFixed(2)} % QWOT against ±${e.worstCut.limit} (${e.mode === 'refit' ? 'joint re-fit' : 'layer-by-layer'})`);
    if (e.layersOut.length) lines.push(`  out of tolerance: layer${e.layersOut.length === 1 ? '' : 's'} ${e.layersOut.join(', ')}`);
    for (const r of e.controlRules) lines.push(`  control-chart rule${r.rules.length === 1 ? '' : 's'} ${r.rules.join(', ')} on layer ${r.layer} ${figureText[r.figure]}`);
    for (const f of e.failed) lines.push(`  analysis failed: ${f}`);
    lines.push(`  ${appLink(`/runs/${e.runId}${e.mode ? `?mode=${e.mode}` : ''}`)}`, '');
  }
  lines.push(
    'Control-chart rules are the Western Electric rules (NIST/SEMATECH e-Handbook §6.3.2) on each chamber\'s runs of the design.',
    "Fringelog's figures are advisory; what to do with a run follows your shop's procedures.", '',
    'Change which e-mails you get on your account page.', '',
  );
  return { subject: `Fringelog: ${window.shift} shift digest, ${window.from.toISOString().slice(0, 10)}, ${entries.length} run${entries.length === 1 ? '' : 's'}, ${flaggedCount} flagged`, text: lines.join('\n') };
}

/**
 * Sends a shift's digest to each engineer and supervisor who opted in. A shift without runs sends
 * nothing (an empty digest every eight hours would teach people to ignore it). Returns the addresses mailed.
 */
export async function sendShiftDigest(window: ShiftWindow): Promise<string[]> {
  const entries = await shiftDigestEntries(window);
  if (entries.length === 0) return [];
  const recipients = await alertRecipients('shiftDigest', roles.filter((r) => can(r, 'receiveToleranceAlerts')));
  for (const u of recipients) {
    const { subject, text } = shiftDigestMail(window, entries, u.name);
    await sendMail(u.email, subject, text);
  }
  return recipients.map((u) => u.email);
}
