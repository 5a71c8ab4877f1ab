// Plot colours, taken from tailwind.config.ts so charts and pages speak one palette.
export const plotPalette = {
  ink: '#17202b',
  inkFaint: '#6b7785',
  grid: '#d9d3c4',
  measured: '#17202b',
  model: '#1f5f68',
  residual: '#8a3a6b',
  band: 'rgba(213, 232, 230, 0.45)',
  bandAlt: 'rgba(235, 231, 220, 0.6)',
  cut: '#b07a1e',
  alarm: '#a3302a',
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
