import 'server-only';
import { RUN_RULES } from '@/analysis/stats';
import { alertRecipients } from '@/db/queries/alerts';
import { analysisAlert, type AnalysisAlert } from '@/db/jobs/analysisAlert';
import { roles } from '@/db/schema';
import { can } from './capabilities';
import { appLink, sendMail } from './mail';

const figureText = { thickness: 'thickness error, % of design', index: 'index deviation', cut: 'cut error, % QWOT' } as const;
const digits = { thickness: 2, index: 4, cut: 2 } as const;

/** The alert e-mail: the run, what is out, which rules fired (with their source), a link to the run. */
export function alertMail(alert: AnalysisAlert, name: string, parts: { outOfTolerance: boolean; controlRules: boolean }): { subject: string; text: string } {
  const a = alert.analysis;
  const lines = [`Hello ${name},`, '', `Run ${a.runCode} (${a.designName}, revision ${a.revision}) in ${a.chamberName}, shift ${a.shift ?? '–'}, ${a.mode === 'refit' ? 'joint re-fit' : 'layer-by-layer'} analysis:`, ''];
  const what: string[] = [];
  if (parts.outOfTolerance && alert.outOfTolerance.length) {
    what.push('out of tolerance');
    lines.push('Out of tolerance:');
    for (const f of alert.outOfTolerance) lines.push(`  layer ${f.layer} (${f.material}): ${figureText[f.figure]} ${f.value.toFixed(digits[f.figure])}, limit ±${f.limit}`);
    lines.push('');
  }
  if (parts.controlRules && alert.controlRules.length) {
    what.push('control-chart rule');
    lines.push(`Control-chart rules fired (this chamber's runs of the design; Western Electric rules, NIST/SEMATECH e-Handbook §6.3.2):`);
    for (const r of alert.controlRules) {
      lines.push(`  layer ${r.layer}, ${figureText[r.figure]} ${r.value.toFixed(digits[r.figure])}: ${r.rules.map((n) => `rule ${n} (${RUN_RULES[n - 1].text})`).join('; ')}`);
    }
    lines.push('');
  }
  lines.push(`The run: ${appLink(`/runs/${a.runId}?mode=${a.mode}`)}`, '', "Fringelog's figures are advisory; what to do with the run follows your shop's procedures.", '', 'Change which alerts you get on your account page.', '');
  return { subject: `Fringelog: run ${a.runCode} ${what.join(' and ')}`, text: lines.join('\n') };
}

/**
 * E-mails each engineer and supervisor who opted in about a finished analysis: one message each,
 * with the parts they asked for, when there is something to say. Returns the addresses mailed.
 */
export async function sendAnalysisAlerts(analysisId: number): Promise<string[]> {
  const alert = await analysisAlert(analysisId);
  if (!alert || (alert.outOfTolerance.length === 0 && alert.controlRules.length === 0)) return [];
  const allowed = roles.filter((r) => can(r, 'receiveToleranceAlerts'));
  const wants = new Map<string, { name: string; outOfTolerance: boolean; controlRules: boolean }>();
  for (const kind of ['outOfTolerance', 'controlRules'] as const) {
    if (alert[kind].length === 0) continue;
    for (const u of await alertRecipients(kind, allowed)) {
      const w = wants.get(u.email) ?? { name: u.name, outOfTolerance: false, controlRules: false };
      w[kind] = true;
      wants.set(u.email, w);
    }
  }
  for (const [email, w] of wants) {
    const { subject, text } = alertMail(alert, w.name, w);
    await sendMail(email, subject, text);
  }
  return [...wants.keys()];
}
