import type { LayerResultRow } from '@/db/schema';

/** Columns of results.csv: name (unit in the name's suffix, as in the trace format) and how to read it from a layer. */
const columns: [string, (l: LayerResultRow) => unknown][] = [
  ['layer', (l) => l.layer],
  ['material', (l) => l.material],
  ['chip', (l) => l.detail.chip],
  ['design_thickness_nm', (l) => l.detail.designThicknessNm],
  ['thickness_nm', (l) => l.thicknessNm],
  ['thickness_sigma_nm', (l) => l.thicknessSigmaNm],
  ['index', (l) => l.index],
  ['index_sigma', (l) => l.indexSigma],
  ['nominal_index', (l) => l.detail.nominalIndex],
  ['rate_nm_per_s', (l) => l.rateNmPerS],
  ['cut_error_qwot_pct', (l) => l.cutErrorQwotPct],
  ['residual_rms', (l) => l.residualRms],
];

function cell(v: unknown): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  const s = String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** One row per layer, the header naming each column with its unit (index and residual are unitless). */
export function resultsCsv(layers: readonly LayerResultRow[]): string {
  const lines = [columns.map(([name]) => name).join(',')];
  for (const l of layers) lines.push(columns.map(([, get]) => cell(get(l))).join(','));
  return lines.join('\n') + '\n';
}
