'use client';

import { useMemo } from 'react';
import { Plot, axis, plotPalette } from '@/components/plot';

export interface ControlChartPlotProps {
  title: string;
  /** Run start times, seconds since 1970. */
  timeS: number[];
  values: number[];
  /** A rule fired at the point. */
  flagged: boolean[];
  inBaseline: boolean[];
  center: number;
  sigma: number;
}

/** Individuals chart: the points, centre line, ±3σ limits and ±2σ, ±1σ zone lines; rule points in alarm colour, baseline points filled. */
export function ControlChartPlot({ title, timeS, values, flagged, inBaseline, center, sigma }: ControlChartPlotProps) {
  const data = useMemo(() => {
    const line = (k: number) => timeS.map(() => center + k * sigma);
    return [
      timeS,
      values,
      values.map((v, i) => (inBaseline[i] ? v : null)),
      values.map((v, i) => (flagged[i] ? v : null)),
      line(0), line(3), line(-3), line(2), line(-2), line(1), line(-1),
    ] as [number[], ...(number | null)[][]];
  }, [timeS, values, flagged, inBaseline, center, sigma]);
  const options = useMemo(() => {
    const limit = (label: string, dash: number[], stroke: string) => ({ label, stroke, dash, width: 1, points: { show: false } });
    return {
      legend: { show: false },
      axes: [axis('run start'), axis(title, { size: 56 })],
      series: [
        {},
        { label: 'run', stroke: plotPalette.ink, width: 1, points: { show: true, size: 6, fill: '#ffffff', stroke: plotPalette.ink } },
        { label: 'baseline', stroke: plotPalette.model, paths: () => null, points: { show: true, size: 6, fill: plotPalette.model, stroke: plotPalette.model } },
        { label: 'rule fired', stroke: plotPalette.alarm, paths: () => null, points: { show: true, size: 10, fill: plotPalette.alarm, stroke: plotPalette.alarm } },
        limit('centre', [], plotPalette.model),
        limit('UCL', [6, 4], plotPalette.alarm),
        limit('LCL', [6, 4], plotPalette.alarm),
        limit('+2σ', [2, 4], plotPalette.cut),
        limit('−2σ', [2, 4], plotPalette.cut),
        limit('+1σ', [1, 5], plotPalette.inkFaint),
        limit('−1σ', [1, 5], plotPalette.inkFaint),
      ],
    };
  }, [title]);
  return <Plot options={options} data={data} heightPx={300} label={`Individuals control chart of ${title}; points where a run rule fired are marked`} />;
}
