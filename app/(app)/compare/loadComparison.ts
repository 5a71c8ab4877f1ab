import 'server-only';
import { groupDifference, individualsChart, runRules, type GroupDifference, type IndividualsChart, type RuleSignal } from '@/analysis/stats';
import { listChambers } from '@/db/queries/chambers';
import {
  compareGroupStats, compareIndexHistory, compareLayerSummary, compareSeries, compareToolingHistory, listComparableDesigns, listShifts,
  type CompareFilter, type CompareMetric, type ComparableDesign, type GroupStatsRow, type LayerSummaryRow, type MaterialPoint, type MetricStats, type SeriesPoint,
} from '@/db/queries/compare';
import type { Chamber } from '@/db/schema';
import type { CompareParams } from './params';

export type Selection = {
  designId: number;
  rev: number | 'all';
  from: string;
  to: string;
  chamberIds: number[];
  shifts: string[];
  mode: 'refit' | 'sequential';
  metric: CompareMetric;
  layer: number;
  bfrom: string;
  bto: string;
};

export type GroupTable = {
  groups: string[];
  rows: { layer: number; cells: Record<string, MetricStats | undefined>; difference: GroupDifference }[];
};

export type ControlPoint = SeriesPoint & { inBaseline: boolean; rules: number[] };
export type ControlView =
  | { ok: true; points: ControlPoint[]; chart: IndividualsChart; signals: RuleSignal[] }
  | { ok: false; points: ControlPoint[]; reason: string };

export type Comparison = {
  designs: ComparableDesign[];
  chambers: Chamber[];
  shiftNames: string[];
  selection: Selection | null;
  layers: LayerSummaryRow[];
  byShift: GroupTable;
  byChamber: GroupTable;
  control: ControlView | null;
  index: MaterialPoint[];
  tooling: MaterialPoint[];
};

const isoDay = (d: Date) => d.toISOString().slice(0, 10);
const dayStart = (s: string) => new Date(`${s}T00:00:00Z`);
const nextDay = (s: string) => new Date(dayStart(s).getTime() + 86400e3);

export function groupTable(rows: GroupStatsRow[]): GroupTable {
  const groups = [...new Set(rows.map((r) => r.group))].sort();
  const layers = [...new Set(rows.map((r) => r.layer))].sort((a, b) => a - b);
  return {
    groups,
    rows: layers.map((layer) => {
      const mine = rows.filter((r) => r.layer === layer);
      const cells = Object.fromEntries(mine.map((r) => [r.group, r]));
      const summaries = mine.filter((r) => r.mean !== null).map((r) => ({ count: r.n, mean: r.mean!, sd: r.sd ?? NaN, outOfTolerance: r.out }));
      return { layer, cells, difference: groupDifference(summaries) };
    }),
  };
}

/** Limits from the points whose run started inside the baseline; rules over every point. */
export function controlView(series: SeriesPoint[], bfrom: string, bto: string): ControlView {
  const lo = dayStart(bfrom).getTime();
  const hi = nextDay(bto).getTime();
  const points: ControlPoint[] = series.map((p) => ({ ...p, inBaseline: p.startedAt.getTime() >= lo && p.startedAt.getTime() < hi, rules: [] }));
  const baseline = points.filter((p) => p.inBaseline).map((p) => p.value);
  if (baseline.length < 2) return { ok: false, points, reason: `the baseline holds ${baseline.length} run${baseline.length === 1 ? '' : 's'}; it needs at least two` };
  const chart = individualsChart(baseline);
  if (!(chart.sigma > 0)) return { ok: false, points, reason: 'the baseline runs show no run-to-run variation' };
  const signals = runRules(points.map((p) => p.value), chart.center, chart.sigma);
  for (const s of signals) if (!points[s.index].rules.includes(s.rule)) points[s.index].rules.push(s.rule);
  return { ok: true, points, chart, signals };
}

/**
 * Everything the compare page and its CSV export show for a selection: defaults filled in
 * from the data (the design with most runs, its whole date span, the first third as baseline,
 * the layer with most values out of tolerance), sums and spreads from PostgreSQL, group tests
 * and the control chart from analysis/stats.
 */
export async function loadComparison(p: CompareParams): Promise<Comparison> {
  const [designs, chambers, shiftNames] = await Promise.all([listComparableDesigns(), listChambers(), listShifts()]);
  const empty: Comparison = { designs, chambers, shiftNames, selection: null, layers: [], byShift: { groups: [], rows: [] }, byChamber: { groups: [], rows: [] }, control: null, index: [], tooling: [] };
  const design = designs.find((d) => d.id === p.design) ?? designs[0];
  if (!design) return empty;
  const from = p.from ?? (design.firstRun ? isoDay(design.firstRun) : isoDay(new Date()));
  const to = p.to ?? (design.lastRun ? isoDay(design.lastRun) : from);
  const span = nextDay(to).getTime() - dayStart(from).getTime();
  const bfrom = p.bfrom ?? from;
  const bto = p.bto ?? isoDay(new Date(dayStart(from).getTime() + Math.max(0, Math.floor(span / 3) - 86400e3)));
  const filter: CompareFilter = {
    designId: design.id, revision: p.rev === undefined || p.rev === 'all' ? null : p.rev, from: dayStart(from), to: nextDay(to),
    chamberIds: p.chamber, shifts: p.shift, mode: p.mode ?? 'refit',
  };
  const metric = p.metric ?? 'cut';
  const layers = await compareLayerSummary(filter);
  const worst = layers.reduce<LayerSummaryRow | undefined>((a, b) => (!a || b[metric].out > a[metric].out ? b : a), undefined);
  const layer = p.layer ?? worst?.layer ?? 1;
  const [byShift, byChamber, series, index, tooling] = await Promise.all([
    compareGroupStats(filter, 'shift', metric), compareGroupStats(filter, 'chamber', metric), compareSeries(filter, layer, metric),
    compareIndexHistory(filter), compareToolingHistory(filter),
  ]);
  return {
    designs, chambers, shiftNames,
    selection: { designId: design.id, rev: filter.revision ?? 'all', from, to, chamberIds: p.chamber, shifts: p.shift, mode: filter.mode, metric, layer, bfrom, bto },
    layers, byShift: groupTable(byShift), byChamber: groupTable(byChamber), control: controlView(series, bfrom, bto), index, tooling,
  };
}
