'use client';

import { useMemo } from 'react';
import { Plot, axis, plotPalette, wholeTicks } from '@/components/plot';

export interface LayerMetricPlotProps {
  title: string;
  layers: number[];
  mean: (number | null)[];
  sd: (number | null)[];
  /** The tolerance drawn as ± lines (largest limit among the layers, when they differ). */
  limit: number | null;
}

/** One figure's mean per layer across the chosen runs, with ±1 sd and the tolerance. */
export function LayerMetricPlot({ title, layers, mean, sd, limit }: LayerMetricPlotProps) {
  const data = useMemo(() => {
    const plus = mean.map((m, i) => (m === null || sd[i] === null ? null : m + sd[i]!));
    const minus = mean.map((m, i) => (m === null || sd[i] === null ? null : m - sd[i]!));
    const lim = layers.map(() => limit);
    const negLim = layers.map(() => (limit === null ? null : -limit));
    return [layers, mean, plus, minus, lim, negLim] as [number[], ...(number | null)[][]];
  }, [layers, mean, sd, limit]);
  const options = useMemo(
    () => ({
      scales: { x: { time: false } },
      legend: { show: false },
      axes: [axis('layer', { values: wholeTicks }), axis(title, { size: 56 })],
      series: [
        {},
        { label: 'mean', stroke: plotPalette.model, width: 2, points: { show: true, size: 7, fill: plotPalette.model } },
        { label: '+1 sd', stroke: plotPalette.inkFaint, dash: [4, 4], width: 1, points: { show: false } },
        { label: '−1 sd', stroke: plotPalette.inkFaint, dash: [4, 4], width: 1, points: { show: false } },
        { label: 'tolerance', stroke: plotPalette.alarm, dash: [2, 6], width: 1, points: { show: false } },
        { label: '−tolerance', stroke: plotPalette.alarm, dash: [2, 6], width: 1, points: { show: false } },
      ],
    }),
    [title],
  );
  return <Plot options={options} data={data} heightPx={200} label={`${title}: mean per layer with ±1 standard deviation and the tolerance`} />;
}
