import { fixed, signed } from '@/components/runs/format';
import { RUN_RULES } from '@/analysis/stats';
import { DataTable } from '@/components/ui/DataTable';
import type { LayerSummaryRow, MetricStats } from '@/db/queries/compare';
import type { ControlView, GroupTable } from './loadComparison';
import { metricInfo, pText } from './metrics';

function pct(out: number, n: number): string {
  return n > 0 ? `${((100 * out) / n).toFixed(0)} %` : '–';
}

function StatCell({ s, digits }: { s: MetricStats | undefined; digits: number }) {
  if (!s || s.n === 0) return <td className="py-2 pr-4 text-ink-faint">–</td>;
  return (
    <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap">
      {signed(s.mean, digits)} <span className="text-ink-faint">± {fixed(s.sd, digits)}</span>
      <span className="block text-ink-faint">
        n {s.n} · out {s.out > 0 ? <span className="text-alarm">{pct(s.out, s.n)}</span> : pct(s.out, s.n)}
      </span>
    </td>
  );
}

export function LayerSummaryTable({ rows }: { rows: LayerSummaryRow[] }) {
  return (
    <DataTable
      testId="compare-layers"
      columns={[
        { key: 'layer', label: 'Layer' },
        { key: 'runs', label: 'Runs' },
        ...(['thickness', 'index', 'cut'] as const).map((m) => ({
          key: m,
          label: (
            <>
              {metricInfo[m].label}
              <span className="block normal-case tracking-normal">{metricInfo[m].unit}: mean ± sd</span>
            </>
          ),
        })),
      ]}
    >
      {rows.map((r) => (
        <tr key={r.layer} data-layer={r.layer}>
          <td className="py-2 pr-4 font-mono">
            {r.layer} <span className="text-xs text-ink-faint">{r.material}</span>
          </td>
          <td className="py-2 pr-4 font-mono">{r.runs}</td>
          <StatCell s={r.thickness} digits={metricInfo.thickness.digits} />
          <StatCell s={r.index} digits={metricInfo.index.digits} />
          <StatCell s={r.cut} digits={metricInfo.cut.digits} />
        </tr>
      ))}
    </DataTable>
  );
}

export function GroupTableView({ table, digits, testId }: { table: GroupTable; digits: number; testId: string }) {
  if (table.rows.length === 0) return <p className="text-ink-soft">No values in this selection.</p>;
  return (
    <DataTable
      testId={testId}
      columns={[{ key: 'layer', label: 'Layer' }, ...table.groups.map((g) => ({ key: `g:${g}`, label: g })), { key: 'difference', label: 'Difference' }]}
    >
      {table.rows.map((r) => (
        <tr key={r.layer} data-layer={r.layer}>
          <td className="py-2 pr-4 font-mono">{r.layer}</td>
          {table.groups.map((g) => (
            <StatCell key={g} s={r.cells[g]} digits={digits} />
          ))}
          <td className="py-2 pr-4 text-xs" data-testid="difference">
            {r.difference.test === null ? (
              <span className="text-ink-faint">no test: {r.difference.reason}</span>
            ) : (
              <>
                <span className={r.difference.pValue < 0.05 ? 'font-semibold text-alarm' : 'text-ink-soft'}>
                  {r.difference.pValue < 0.05 ? 'larger than chance' : 'within chance'}
                </span>
                <span className="block font-mono text-ink-faint">
                  {r.difference.test === 'welch-t' ? `t = ${fixed(r.difference.statistic, 2)}` : `F = ${fixed(r.difference.statistic, 2)}`}, p {pText(r.difference.pValue)}
                </span>
              </>
            )}
          </td>
        </tr>
      ))}
    </DataTable>
  );
}

export function RuleSignals({ control, digits }: { control: Extract<ControlView, { ok: true }>; digits: number }) {
  const flagged = control.points.filter((p) => p.rules.length > 0);
  return (
    <div className="mt-3 text-sm">
      <p className="font-mono text-xs text-ink-soft">
        centre {signed(control.chart.center, digits)} · σ̂ = MR̄/1.128 = {fixed(control.chart.sigma, digits)} · limits {signed(control.chart.lower, digits)} to{' '}
        {signed(control.chart.upper, digits)} · baseline {control.chart.baselineCount} runs
      </p>
      {flagged.length === 0 ? (
        <p className="mt-2 text-ink-soft" data-testid="rule-signals">
          No run rule fired.
        </p>
      ) : (
        <ul className="mt-2 space-y-1" data-testid="rule-signals">
          {RUN_RULES.map(({ rule, text }) => {
            const at = flagged.filter((p) => p.rules.includes(rule));
            if (at.length === 0) return null;
            return (
              <li key={rule}>
                <span className="font-semibold text-alarm">Rule {rule}</span> ({text}): {at.length} run{at.length === 1 ? '' : 's'} —{' '}
                <span className="font-mono text-xs">{at.slice(0, 12).map((p) => `${p.runCode} (${p.shift ?? '–'}, ${p.chamber})`).join(', ')}{at.length > 12 ? ', …' : ''}</span>
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}
