// Plot colours, taken from tailwind.config.ts so charts and pages speak one palette.
export const plotPalette = {
  ink: '#17202b',
  paper: '#fffdf8',
  inkFaint: '#6b7785',
  grid: '#d9d3c4',
  measured: 'rgba(23, 32, 43, 0.5)',
  model: '#1f5f68',
  residual: '#8a3a6b',
  band: 'rgba(213, 232, 230, 0.45)',
  bandAlt: 'rgba(235, 231, 220, 0.6)',
  cut: '#b07a1e',
  alarm: '#a3302a',
  // Tolerance grades (tailwind leaf, brass, alarm).
  within: '#2f7a4f',
  near: '#b07a1e',
  outside: '#a3302a',
  annotation: '#8a3a6b',
  chip: '#3b4756',
  font: '12px var(--font-plex-sans), sans-serif',
} as const;

/** Axis defaults in the app's look (uPlot.Axis). */
export function axis(label: string, extra: Record<string, unknown> = {}) {
  return {
    label,
    stroke: plotPalette.inkFaint,
    font: plotPalette.font,
    labelFont: plotPalette.font,
    grid: { stroke: plotPalette.grid, width: 1 },
    ticks: { stroke: plotPalette.grid, width: 1 },
    ...extra,
  };
}

/**
 * Tick labels with as many decimals as the tick step needs (uPlot's default rounds to three, so
 * steps of 0.0005 read "0.001, 0.001"). For numeric axes only.
 */
export function stepTicks(_u: unknown, ticks: number[], _axis: number, _space: number, step: number): string[] {
  const decimals = Math.max(0, Math.min(8, -Math.floor(Math.log10(step) + 1e-9)));
  return ticks.map((t) => (t === 0 ? '0' : t.toFixed(decimals)));
}

/** Tick labels on whole numbers only (layer counts and orders). */
export function wholeTicks(_u: unknown, ticks: number[]): string[] {
  return ticks.map((t) => (Number.isInteger(t) ? String(t) : ''));
}
