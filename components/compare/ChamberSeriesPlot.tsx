'use client';

import { useMemo } from 'react';
import { Plot, axis, plotPalette } from '@/components/plot';

const colours = [plotPalette.model, plotPalette.residual, plotPalette.cut, plotPalette.ink];

export interface ChamberSeriesPlotProps {
  title: string;
  /** One series per chamber: [run start in seconds since 1970, value]. */
  series: { name: string; points: [number, number][] }[];
}

/** Values over time, one colour per chamber, points only (runs are separate events, not a curve). */
export function ChamberSeriesPlot({ title, series }: ChamberSeriesPlotProps) {
  const data = useMemo(() => {
    const xs = [...new Set(series.flatMap((s) => s.points.map((p) => p[0])))].sort((a, b) => a - b);
    const at = new Map(xs.map((x, i) => [x, i]));
    const ys = series.map((s) => {
      const y: (number | null)[] = xs.map(() => null);
      for (const [x, v] of s.points) y[at.get(x)!] = v;
      return y;
    });
    return [xs, ...ys] as [number[], ...(number | null)[][]];
  }, [series]);
  const options = useMemo(
    () => ({
      legend: { show: true },
      axes: [axis('run start'), axis(title, { size: 60 })],
      series: [
        {},
        ...series.map((s, i) => ({
          label: s.name,
          stroke: colours[i % colours.length],
          paths: () => null,
          points: { show: true, size: 6, fill: colours[i % colours.length], stroke: colours[i % colours.length] },
        })),
      ],
    }),
    [title, series],
  );
  return <Plot options={options} data={data} heightPx={220} label={`${title} over time, by chamber`} />;
}
