import type { CompareMetric } from '@/db/queries/compare';

export const metricInfo: Record<CompareMetric, { label: string; short: string; unit: string; digits: number }> = {
  thickness: { label: 'Thickness error', short: 'thickness', unit: '% of design', digits: 2 },
  index: { label: 'Index deviation', short: 'index', unit: 'from nominal', digits: 4 },
  cut: { label: 'Cut error', short: 'cut', unit: '% QWOT', digits: 2 },
};

export const modeLabels = { refit: 'Joint re-fit', sequential: 'Layer by layer' } as const;

export function pText(p: number): string {
  return p < 0.001 ? '< 0.001' : p.toFixed(3);
}
