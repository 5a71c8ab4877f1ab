import type { Comparison } from './loadComparison';
import { metricInfo } from './metrics';

export const csvTables = ['layers', 'shift', 'chamber', 'control', 'index', 'tooling'] as const;
export type CsvTable = (typeof csvTables)[number];

const cell = (v: unknown): string => {
  if (v === null || v === undefined || (typeof v === 'number' && !Number.isFinite(v))) return '';
  const s = v instanceof Date ? v.toISOString() : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};
const lines = (rows: unknown[][]) => rows.map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';

/** One table of the compare page as CSV (RFC 4180: quoted where needed, CRLF line ends), the same figures the page shows. */
export function compareCsv(c: Comparison, table: CsvTable): string {
  const s = c.selection;
  if (!s) return lines([['no analysed runs']]);
  const metric = metricInfo[s.metric];
  switch (table) {
    case 'layers':
      return lines([
        ['layer', 'material', 'runs', ...(['thickness', 'index', 'cut'] as const).flatMap((m) => [`${m}_n`, `${m}_mean`, `${m}_sd`, `${m}_out_of_tolerance`, `${m}_limit`])],
        ...c.layers.map((l) => [l.layer, l.material, l.runs, ...(['thickness', 'index', 'cut'] as const).flatMap((m) => [l[m].n, l[m].mean, l[m].sd, l[m].out, l[m].limit])]),
      ]);
    case 'shift':
    case 'chamber': {
      const t = table === 'shift' ? c.byShift : c.byChamber;
      return lines([
        ['layer', table, 'figure', 'n', 'mean', 'sd', 'out_of_tolerance', 'test', 'statistic', 'df1', 'df2', 'p_value'],
        ...t.rows.flatMap((r) =>
          t.groups.map((g) => {
            const x = r.cells[g];
            const d = r.difference;
            return [r.layer, g, `${metric.label} (${metric.unit})`, x?.n ?? 0, x?.mean, x?.sd, x?.out ?? 0, d.test ?? `none: ${d.reason}`,
              d.test ? d.statistic : null, d.test ? d.df1 : null, d.test ? d.df2 : null, d.test ? d.pValue : null];
          }),
        ),
      ]);
    }
    case 'control': {
      const v = c.control;
      const chart = v?.ok ? v.chart : null;
      return lines([
        ['run_code', 'started_at', 'chamber', 'shift', 'layer', 'figure', 'value', 'in_baseline', 'rules_fired', 'center', 'lcl', 'ucl'],
        ...(v?.points ?? []).map((p) => [p.runCode, p.startedAt, p.chamber, p.shift, s.layer, `${metric.label} (${metric.unit})`, p.value, p.inBaseline ? 'yes' : 'no',
          p.rules.join(' '), chart?.center, chart?.lower, chart?.upper]),
      ]);
    }
    case 'index':
    case 'tooling':
      return lines([
        ['run_code', 'started_at', 'chamber', 'material', table === 'index' ? 'mean_index' : 'mean_tooling_factor', 'layers'],
        ...(table === 'index' ? c.index : c.tooling).map((p) => [p.runCode, p.startedAt, p.chamber, p.material, p.value, p.layers]),
      ]);
  }
}
