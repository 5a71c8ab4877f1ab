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
