import type { Metadata } from 'next';
import Link from 'next/link';
import { RUN_RULES_SOURCE } from '@/analysis/stats';
import { ChamberSeriesPlot, ControlChartPlot, LayerMetricPlot } from '@/components/compare';
import { formatDate } from '@/components/runs/format';
import { PageHeader, Panel } from '@/components/ui/Page';
import type { MaterialPoint } from '@/db/queries/compare';
import { requireCapability } from '@/app/_lib/auth';
import { Filters } from './Filters';
import { loadComparison, type Selection } from './loadComparison';
import { metricInfo, modeLabels } from './metrics';
import { compareParamsSchema, paramsObject, queryOf, type CompareParams } from './params';
import { GroupTableView, LayerSummaryTable, RuleSignals } from './Tables';

export const metadata: Metadata = { title: 'Compare runs' };

const WELCH_NOTE =
  "Two groups: Welch's t-test (B. L. Welch, Biometrika 34, 1947; NIST/SEMATECH e-Handbook §1.3.5.3). More groups: Welch's one-way ANOVA (B. L. Welch, Biometrika 38, 1951). Neither assumes the groups scatter alike. “Larger than chance” means p < 0.05: a difference this large would arise by chance in fewer than 1 in 20 selections of runs that really share one mean.";

function selectionQuery(s: Selection, extra: Record<string, string> = {}): string {
  return queryOf({ design: s.designId, rev: s.rev, from: s.from, to: s.to, chamber: s.chamberIds, shift: s.shifts, mode: s.mode, metric: s.metric, layer: s.layer, bfrom: s.bfrom, bto: s.bto, ...extra });
}

function CsvLink({ s, table }: { s: Selection; table: string }) {
  return (
    <a href={`/api/compare/csv?${selectionQuery(s, { table })}`} className="text-sm text-fringe underline-offset-2 hover:underline" download>
      CSV
    </a>
  );
}

function PanelHead({ title, s, table, children }: { title: string; s: Selection; table: string; children?: React.ReactNode }) {
  return (
    <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
      <h2 className="text-sm font-semibold uppercase tracking-wider text-ink-faint">{title}</h2>
      <div className="flex gap-3">
        {children}
        <CsvLink s={s} table={table} />
      </div>
    </div>
  );
}

function byMaterialAndChamber(points: MaterialPoint[]) {
  const materials = [...new Set(points.map((p) => p.material))].sort();
  return materials.map((material) => {
    const mine = points.filter((p) => p.material === material);
    const chambers = [...new Set(mine.map((p) => p.chamber))].sort();
    return {
      material,
      series: chambers.map((name) => ({ name, points: mine.filter((p) => p.chamber === name).map((p): [number, number] => [p.startedAt.getTime() / 1000, p.value]) })),
    };
  });
}

export default async function ComparePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  await requireCapability('compareRuns');
  const parsed = compareParamsSchema.safeParse(paramsObject(await searchParams));
  const fallback: CompareParams = { chamber: [], shift: [] };
  const c = await loadComparison(parsed.success ? parsed.data : fallback);
  const s = c.selection;
  const badParams = parsed.success ? null : parsed.error.issues.map((i) => `${i.path.join('.') || 'address'}: ${i.message}`).join('; ');

  return (
    <>
      <PageHeader
        title="Compare runs"
        lead="One design's runs side by side: how each layer came out, whether shifts or chambers differ by more than chance, and whether the process stays in control."
      />
      <p className="mb-6 rounded-md border border-brass/40 bg-brass-light px-4 py-2 text-sm" data-testid="advisory">
        These figures are advisory; what to change in the chamber, and whether to hold runs, follows your shop&apos;s procedures.
      </p>
      {badParams ? (
        <p className="mb-6 rounded-md border border-alarm/40 bg-alarm-light px-4 py-2 text-sm text-alarm" role="alert">
          The address asked for something unreadable ({badParams}); showing the default selection instead.
        </p>
      ) : null}
      {!s ? (
        <Panel>
          <p className="text-ink-soft" data-testid="compare-empty">
            No analysed runs yet. Runs appear here once their analyses are stored.
          </p>
        </Panel>
      ) : (
        <div className="space-y-6">
          <Panel>
            <Filters c={c} s={s} />
          </Panel>
          <Panel>
            <PanelHead title={`Per layer · ${c.layers.reduce((n, l) => Math.max(n, l.runs), 0)} runs · ${modeLabels[s.mode]}`} s={s} table="layers" />
            {c.layers.length === 0 ? (
              <p className="text-ink-soft">No analysed runs match this selection.</p>
            ) : (
              <>
                <LayerSummaryTable rows={c.layers} />
                <div className="mt-4 grid gap-4 lg:grid-cols-3">
                  {(['thickness', 'index', 'cut'] as const).map((m) => (
                    <div key={m} className="min-w-0">
                      <h3 className="mb-1 text-xs font-medium text-ink-soft">
                        {metricInfo[m].label}, {metricInfo[m].unit}
                      </h3>
                      <LayerMetricPlot
                        title={metricInfo[m].unit}
                        layers={c.layers.map((l) => l.layer)}
                        mean={c.layers.map((l) => l[m].mean)}
                        sd={c.layers.map((l) => l[m].sd)}
                        limit={c.layers.reduce<number | null>((a, l) => (l[m].limit === null ? a : Math.max(a ?? 0, l[m].limit!)), null)}
                      />
                    </div>
                  ))}
                </div>
                <p className="mt-2 text-xs text-ink-faint">
                  Out = share of values beyond the layer&apos;s tolerance (the design layer&apos;s own, else the design&apos;s, else the shop default). Index deviation leaves out layers whose
                  index was held rather than fitted.
                </p>
              </>
            )}
          </Panel>
          {(['shift', 'chamber'] as const).map((by) => (
            <Panel key={by}>
              <PanelHead title={`${metricInfo[s.metric].label} (${metricInfo[s.metric].unit}) by ${by}`} s={s} table={by} />
              <GroupTableView table={by === 'shift' ? c.byShift : c.byChamber} digits={metricInfo[s.metric].digits} testId={`compare-by-${by}`} />
              <p className="mt-2 text-xs text-ink-faint">{WELCH_NOTE}</p>
            </Panel>
          ))}
          <Panel>
            <PanelHead title={`Control chart · layer ${s.layer} · ${metricInfo[s.metric].label} (${metricInfo[s.metric].unit})`} s={s} table="control" />
            {!c.control || c.control.points.length === 0 ? (
              <p className="text-ink-soft">No values for this layer in the selection.</p>
            ) : !c.control.ok ? (
              <p className="text-ink-soft">No limits: {c.control.reason}. Choose a baseline period with more runs.</p>
            ) : (
              <>
                <ControlChartPlot
                  title={metricInfo[s.metric].unit}
                  timeS={c.control.points.map((p) => p.startedAt.getTime() / 1000)}
                  values={c.control.points.map((p) => p.value)}
                  flagged={c.control.points.map((p) => p.rules.length > 0)}
                  inBaseline={c.control.points.map((p) => p.inBaseline)}
                  center={c.control.chart.center}
                  sigma={c.control.chart.sigma}
                />
                <RuleSignals control={c.control} digits={metricInfo[s.metric].digits} />
                <p className="mt-2 text-xs text-ink-faint">
                  Individuals chart: limits X̄ ± 2.66·MR̄ from the baseline runs ({formatDate(new Date(`${s.bfrom}T00:00:00Z`))} to {formatDate(new Date(`${s.bto}T00:00:00Z`))}, filled
                  points), NIST/SEMATECH e-Handbook of Statistical Methods §6.3.2.2. Rules: {RUN_RULES_SOURCE}. Points in the alarm colour completed a rule&apos;s pattern.
                </p>
              </>
            )}
          </Panel>
          <Panel>
            <PanelHead title="Index by material, per chamber" s={s} table="index" />
            {c.index.length === 0 ? (
              <p className="text-ink-soft">No fitted indices in this selection.</p>
            ) : (
              <div className="grid gap-4 lg:grid-cols-2">
                {byMaterialAndChamber(c.index).map((m) => (
                  <div key={m.material} className="min-w-0">
                    <h3 className="mb-1 text-xs font-medium text-ink-soft">Material {m.material}: mean fitted index of the run&apos;s layers at the monitor wavelength</h3>
                    <ChamberSeriesPlot title={`n (${m.material})`} series={m.series} />
                  </div>
                ))}
              </div>
            )}
          </Panel>
          <Panel>
            <PanelHead title="Tooling factor (optical ÷ crystal thickness)" s={s} table="tooling" />
            {c.tooling.length === 0 ? (
              <p className="text-ink-soft">None of these runs logged crystal readings (a crystal_nm column).</p>
            ) : (
              <div className="grid gap-4 lg:grid-cols-2">
                {byMaterialAndChamber(c.tooling).map((m) => (
                  <div key={m.material} className="min-w-0">
                    <h3 className="mb-1 text-xs font-medium text-ink-soft">Material {m.material}</h3>
                    <ChamberSeriesPlot title={`tooling (${m.material})`} series={m.series} />
                  </div>
                ))}
              </div>
            )}
          </Panel>
          <p className="text-sm">
            <Link href="/runs" className="text-fringe underline-offset-2 hover:underline">
              All runs
            </Link>
          </p>
        </div>
      )}
    </>
  );
}
