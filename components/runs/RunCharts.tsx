'use client';

import { useMemo, useState } from 'react';
import type uPlot from 'uplot';
import { Plot, axis, plotPalette, stepTicks, wholeTicks } from '@/components/plot';

export type IndexSeries = {
  material: string;
  label: string;
  timeS: number[];
  deviation: number[];
  /** Each point's σ, drawn as a bar of ±1σ (NaN: none). */
  sigma?: number[];
  interceptPerHour: number | null;
  slopePerHour: number | null;
  interceptPerLayer: number | null;
  slopePerLayer: number | null;
};

const materialColours = [plotPalette.model, plotPalette.residual, plotPalette.cut, plotPalette.ink];
const toggle = (on: boolean) => `rounded-md border px-2 py-0.5 text-xs ${on ? 'border-fringe bg-fringe-light text-fringe-dark' : 'border-paper-line bg-paper-raised text-ink-soft'}`;

/** Fitted index − nominal per material, against the material's layer order or the time into the run, with each trend line. */
export function IndexPlot({ series, wavelengthNm }: { series: IndexSeries[]; wavelengthNm: number | null }) {
  const [by, setBy] = useState<'order' | 'time'>('order');
  const { data, options } = useMemo(() => {
    const xs = new Set<number>();
    const xOf = (s: IndexSeries, i: number) => (by === 'order' ? i + 1 : s.timeS[i] / 60);
    series.forEach((s) => s.deviation.forEach((_, i) => xs.add(xOf(s, i))));
    const x = [...xs].sort((a, b) => a - b);
    const cols: (number | null)[][] = [];
    const uSeries: uPlot.Series[] = [{ label: by === 'order' ? 'layer of the material' : 'minutes' }];
    // ±1σ bars: x, centre, σ and colour of every point with a finite σ
    const bars: { x: number; y: number; s: number; colour: string }[] = [];
    series.forEach((s, k) => {
      const colour = materialColours[k % materialColours.length];
      s.deviation.forEach((d, i) => {
        const sd = s.sigma?.[i];
        if (sd !== undefined && Number.isFinite(sd) && sd > 0) bars.push({ x: xOf(s, i), y: d, s: sd, colour });
      });
      const at = new Map(s.deviation.map((d, i) => [xOf(s, i), d]));
      cols.push(x.map((v) => at.get(v) ?? null));
      uSeries.push({ label: s.label, stroke: colour, paths: () => null, points: { show: true, size: 7, fill: colour } });
      const [a, b] = by === 'order' ? [s.interceptPerLayer, s.slopePerLayer] : [s.interceptPerHour, s.slopePerHour];
      const own = x.filter((v) => at.has(v));
      const lo = own[0], hi = own[own.length - 1];
      const scale = by === 'order' ? 1 : 1 / 60; // the time trend is per hour; x is in minutes
      cols.push(x.map((v) => (a !== null && b !== null && Number.isFinite(a) && Number.isFinite(b) && v >= lo && v <= hi ? a + b * v * scale : null)));
      uSeries.push({ label: `${s.label} trend`, stroke: colour, width: 1, spanGaps: true, points: { show: false } });
    });
    return {
      data: [x, ...cols] as uPlot.AlignedData,
      options: {
        legend: { show: false },
        scales: {
          x: { time: false, ...(by === 'order' ? { range: (_u: uPlot, lo: number, hi: number): uPlot.Range.MinMax => [Math.floor(lo) - 0.5, Math.ceil(hi) + 0.5] } : {}) },
          // the bars inside the plot, and zero (the nominal) always in view
          y: {
            range: (_u: uPlot, lo: number, hi: number): uPlot.Range.MinMax => {
              let a = Math.min(lo, 0), b = Math.max(hi, 0);
              for (const e of bars) {
                a = Math.min(a, e.y - e.s);
                b = Math.max(b, e.y + e.s);
              }
              const pad = (b - a || 0.001) * 0.08;
              return [a - pad, b + pad];
            },
          },
        },
        series: uSeries,
        axes: [
          axis(by === 'order' ? 'layer of that material, in deposition order' : 'minutes into the run', by === 'order' ? { values: wholeTicks } : { values: stepTicks }),
          axis(`index − nominal${wavelengthNm ? ` at ${wavelengthNm} nm` : ''}`, { size: 64, values: stepTicks }),
        ],
        hooks: {
          draw: [
            (u: uPlot) => {
              const ctx = u.ctx;
              ctx.save();
              ctx.lineWidth = Math.max(1, devicePixelRatio);
              for (const e of bars) {
                const x = u.valToPos(e.x, 'x', true), y0 = u.valToPos(e.y - e.s, 'y', true), y1 = u.valToPos(e.y + e.s, 'y', true);
                const w = 4 * devicePixelRatio;
                ctx.strokeStyle = e.colour;
                ctx.beginPath();
                ctx.moveTo(x, y0);
                ctx.lineTo(x, y1);
                for (const y of [y0, y1]) {
                  ctx.moveTo(x - w, y);
                  ctx.lineTo(x + w, y);
                }
                ctx.stroke();
              }
              ctx.restore();
            },
          ],
        },
      } satisfies Omit<uPlot.Options, 'width' | 'height'>,
    };
  }, [series, by, wavelengthNm]);
  if (series.length === 0) return <p className="text-sm text-ink-soft">No fitted index to plot (thin layers are held).</p>;
  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-xs">
        <span className="text-ink-faint">against</span>
        <button type="button" aria-pressed={by === 'order'} className={toggle(by === 'order')} onClick={() => setBy('order')}>layer order</button>
        <button type="button" aria-pressed={by === 'time'} className={toggle(by === 'time')} onClick={() => setBy('time')}>time</button>
        {series.map((s, k) => (
          <span key={s.material} className="ml-2 inline-flex items-center gap-1">
            <svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="4" fill={materialColours[k % materialColours.length]} /></svg>
            {s.label}
          </span>
        ))}
      </div>
      <Plot options={options} data={data} heightPx={220} label="Fitted index minus nominal, per material, each with its ±1σ bar, and trend lines" />
    </div>
  );
}

export type SpectrumView = { wavelengthNm: number[]; designR: number[]; designT: number[]; asBuiltR: number[]; asBuiltT: number[] };

/** The as-built spectrum (the fitted layers) against the design's, R or T in %. */
export function SpectrumPlot({ spectrum }: { spectrum: SpectrumView }) {
  const [q, setQ] = useState<'R' | 'T'>('R');
  const options = useMemo(
    () =>
      ({
        legend: { show: false },
        scales: { x: { time: false } },
        series: [
          { label: 'nm' },
          { label: `design ${q}`, stroke: plotPalette.inkFaint, width: 1.25 },
          { label: `as built ${q}`, stroke: plotPalette.model, width: 2 },
        ],
        axes: [axis('wavelength, nm'), axis(`${q}, %`, { size: 56 })],
      }) satisfies Omit<uPlot.Options, 'width' | 'height'>,
    [q],
  );
  const data = useMemo(() => {
    const pct = (a: number[]) => a.map((v) => v * 100);
    return [spectrum.wavelengthNm, pct(q === 'R' ? spectrum.designR : spectrum.designT), pct(q === 'R' ? spectrum.asBuiltR : spectrum.asBuiltT)] as uPlot.AlignedData;
  }, [spectrum, q]);
  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-xs">
        <button type="button" aria-pressed={q === 'R'} className={toggle(q === 'R')} onClick={() => setQ('R')}>reflectance</button>
        <button type="button" aria-pressed={q === 'T'} className={toggle(q === 'T')} onClick={() => setQ('T')}>transmittance</button>
        <span className="ml-2 inline-flex items-center gap-1"><span className="inline-block h-0.5 w-4 bg-ink-faint" />design</span>
        <span className="inline-flex items-center gap-1"><span className="inline-block h-0.5 w-4 bg-fringe" />as built (fitted layers)</span>
      </div>
      <Plot options={options} data={data} heightPx={220} label={`As-built against design ${q === 'R' ? 'reflectance' : 'transmittance'}`} />
    </div>
  );
}
