import { individualsChart } from './individualsChart';
import { runRules, type RuleNumber } from './runRules';

/**
 * The Western Electric rules that the newest value completes, on an individuals chart whose
 * limits come from the values before it (the last `baselineSize` of them). Too short a history
 * (under `minBaseline`) or one without run-to-run variation gives no rules: an empty list.
 */
export function newestPointRules(previous: readonly number[], newest: number, baselineSize = 20, minBaseline = 8): RuleNumber[] {
  const baseline = previous.slice(-baselineSize);
  if (baseline.length < minBaseline) return [];
  const chart = individualsChart(baseline);
  if (!(chart.sigma > 0)) return [];
  const series = [...baseline, newest];
  const last = series.length - 1;
  return [...new Set(runRules(series, chart.center, chart.sigma).filter((s) => s.index === last).map((s) => s.rule))];
}
