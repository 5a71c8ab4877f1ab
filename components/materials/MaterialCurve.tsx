'use client';

import { useMemo } from 'react';
import type uPlot from 'uplot';
import { indexAt, validRangeNm, type MaterialModel } from '@/analysis/materials';
import { Plot, axis, plotPalette } from '@/components/plot';

/** Where to draw a model with an open range: the visible and near infrared (a choice for the plot only). */
const OPEN_FROM_NM = 300;
const OPEN_TO_NM = 2000;

export function curveRange(model: MaterialModel): { fromNm: number; toNm: number } {
  const { fromNm, toNm } = validRangeNm(model);
  const from = fromNm > 0 ? fromNm : Math.min(OPEN_FROM_NM, toNm / 2);
  const to = Number.isFinite(toNm) ? toNm : Math.max(OPEN_TO_NM, from * 2);
  return { fromNm: from, toNm: to };
}

/** n(λ) and k(λ) of a model over its valid range (points where the model fails are left out). */
export function MaterialCurve({ model, name }: { model: MaterialModel; name: string }) {
  const data = useMemo(() => {
    const { fromNm, toNm } = curveRange(model);
    const count = 301;
    const wl: number[] = [];
    const n: (number | null)[] = [];
    const k: (number | null)[] = [];
    for (let i = 0; i < count; i++) {
      const x = fromNm + ((toNm - fromNm) * i) / (count - 1);
      wl.push(x);
      try {
        const N = indexAt(model, x);
        n.push(N.re);
        k.push(-N.im);
      } catch {
        n.push(null);
        k.push(null);
      }
    }
    return [wl, n, k] as uPlot.AlignedData;
  }, [model]);
  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'>>(
    () => ({
      // k is often 0 throughout: a fixed floor keeps the axis from inventing a 0–100 range.
      scales: { x: { time: false }, k: { range: (_u, _min, max) => [0, Math.max((max ?? 0) * 1.2, 0.001)] } },
      axes: [axis('Wavelength (nm)'), axis('n'), axis('k', { side: 1, scale: 'k', grid: { show: false }, values: (_u: uPlot, ticks: number[]) => ticks.map((t) => (t === 0 ? '0' : Math.abs(t) < 0.01 ? t.toExponential(0) : t.toFixed(2))) })],
      series: [
        { label: 'λ (nm)', value: (_u, v) => (v == null ? '–' : v.toFixed(0)) },
        { label: 'n', stroke: plotPalette.model, width: 2, value: (_u, v) => (v == null ? '–' : v.toFixed(4)) },
        { label: 'k', stroke: plotPalette.residual, width: 1.5, dash: [6, 4], scale: 'k', value: (_u, v) => (v == null ? '–' : v.toExponential(2)) },
      ],
    }),
    [],
  );
  const { fromNm, toNm } = curveRange(model);
  return <Plot options={options} data={data} label={`Refractive index n and extinction coefficient k of ${name} from ${fromNm.toFixed(0)} to ${toNm.toFixed(0)} nm`} heightPx={260} />;
}
