'use client';

import { useMemo, useState } from 'react';
import type uPlot from 'uplot';
import { designSpectrum, parseDesign, spectrumRange, type Design } from '@/analysis/design';
import { Plot, axis, plotPalette } from '@/components/plot';

export type SpectrumSource = { label: string; document: unknown };

type Settings = { fromNm: string; toNm: string; angleDeg: string; pol: 'mean' | 's' | 'p'; backside: 'design' | 'with' | 'without'; showR: boolean; showT: boolean };

const colours = [plotPalette.model, plotPalette.residual, plotPalette.cut, plotPalette.ink];

function input(v: string, fallback: number): number {
  const n = Number(v);
  return v.trim() !== '' && Number.isFinite(n) ? n : fallback;
}

/**
 * R and T of one or more designs (a revision, or two being compared) at the angle, polarisation
 * and backside treatment the reader picks, computed in the browser by analysis/design.
 */
export function SpectrumPlot({ sources, referenceWavelengthNm }: { sources: SpectrumSource[]; referenceWavelengthNm: number }) {
  const [s, setS] = useState<Settings>({
    fromNm: String(Math.round((0.7 * referenceWavelengthNm) / 10) * 10),
    toNm: String(Math.round((1.45 * referenceWavelengthNm) / 10) * 10),
    angleDeg: '0',
    pol: 'mean',
    backside: 'design',
    showR: true,
    showT: true,
  });
  const set = (patch: Partial<Settings>) => setS((old) => ({ ...old, ...patch }));

  const designs = useMemo(() => sources.map((src) => ({ label: src.label, design: parseDesign(src.document) as Design })), [sources]);
  const result = useMemo(() => {
    const fromNm = input(s.fromNm, 400);
    const toNm = input(s.toNm, 800);
    const angleDeg = input(s.angleDeg, 0);
    if (!(fromNm > 0) || !(toNm > fromNm)) return { error: 'The range must run from a wavelength above 0 nm up to a longer one.' };
    if (!(angleDeg >= 0 && angleDeg < 90)) return { error: 'The angle must be at least 0° and below 90°.' };
    const stepNm = Math.max((toNm - fromNm) / 600, 0.05);
    try {
      // Only where every material of each design has an index (a measured table may cover less).
      const ranges = designs.map(({ label, design }) => ({ label, range: spectrumRange(design, { fromNm, toNm, stepNm }) }));
      const none = ranges.find((r) => !r.range);
      if (none) return { error: `No wavelength of ${fromNm}–${toNm} nm has an index for every material of ${none.label}.` };
      const from = Math.max(...ranges.map((r) => r.range!.fromNm)), to = Math.min(...ranges.map((r) => r.range!.toNm));
      if (!(to > from)) return { error: `The designs' materials have no wavelengths of ${fromNm}–${toNm} nm in common.` };
      const cut = ranges.find((r) => r.range!.limitedBy);
      const note = cut ? `Shown over ${Number(from.toFixed(1))}–${Number(to.toFixed(1))} nm only: ${cut.range!.limitedBy}${ranges.length > 1 ? ` (${cut.label})` : ''}.` : null;
      const spectra = designs.map(({ label, design }) => {
        const d = s.backside === 'design' ? design : { ...design, substrateBackside: s.backside === 'with' };
        return { label, ...designSpectrum(d, { fromNm: from, toNm: to, stepNm, angleDeg, pol: s.pol }) };
      });
      return { spectra, note };
    } catch (e) {
      return { error: (e as Error).message };
    }
  }, [designs, s]);

  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'> | null>(() => {
    if (!('spectra' in result) || !result.spectra) return null;
    const series: uPlot.Series[] = [{ label: 'λ (nm)', value: (_u, v) => (v == null ? '–' : v.toFixed(1)) }];
    result.spectra.forEach((sp, i) => {
      const tag = result.spectra.length > 1 ? `${sp.label} ` : '';
      series.push({ label: `${tag}R %`, stroke: colours[i % colours.length], width: 2, show: s.showR, value: (_u, v) => (v == null ? '–' : v.toFixed(3)) });
      series.push({ label: `${tag}T %`, stroke: colours[i % colours.length], width: 1.5, dash: [6, 4], show: s.showT, scale: 'T', value: (_u, v) => (v == null ? '–' : v.toFixed(3)) });
    });
    return {
      scales: { x: { time: false } },
      axes: [axis('Wavelength (nm)'), axis('R (%)'), axis('T (%)', { side: 1, scale: 'T', grid: { show: false } })],
      series,
    };
  }, [result, s.showR, s.showT]);

  const data = useMemo(() => {
    if (!('spectra' in result) || !result.spectra) return null;
    const out: (number[] | Float64Array)[] = [Array.from(result.spectra[0].wavelengthNm)];
    for (const sp of result.spectra) {
      out.push(Array.from(sp.R, (v) => 100 * v));
      out.push(Array.from(sp.T, (v) => 100 * v));
    }
    return out as uPlot.AlignedData;
  }, [result]);

  const field = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1 text-sm';
  return (
    <div className="flex flex-col gap-3" data-testid="spectrum">
      <div className="flex flex-wrap items-end gap-3 text-sm">
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">From (nm)</span>
          <input className={`${field} w-24`} inputMode="decimal" value={s.fromNm} onChange={(e) => set({ fromNm: e.target.value })} />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">To (nm)</span>
          <input className={`${field} w-24`} inputMode="decimal" value={s.toNm} onChange={(e) => set({ toNm: e.target.value })} />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Angle (°)</span>
          <input className={`${field} w-20`} inputMode="decimal" value={s.angleDeg} onChange={(e) => set({ angleDeg: e.target.value })} data-testid="spectrum-angle" />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Polarisation</span>
          <select className={field} value={s.pol} onChange={(e) => set({ pol: e.target.value as Settings['pol'] })}>
            <option value="mean">mean of s and p</option>
            <option value="s">s</option>
            <option value="p">p</option>
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Back face</span>
          <select className={field} value={s.backside} onChange={(e) => set({ backside: e.target.value as Settings['backside'] })}>
            <option value="design">as designed</option>
            <option value="with">bare back face counted</option>
            <option value="without">front face only</option>
          </select>
        </label>
        <label className="flex items-center gap-2 py-1">
          <input type="checkbox" checked={s.showR} onChange={(e) => set({ showR: e.target.checked })} /> R
        </label>
        <label className="flex items-center gap-2 py-1">
          <input type="checkbox" checked={s.showT} onChange={(e) => set({ showT: e.target.checked })} /> T
        </label>
      </div>
      {'error' in result && result.error ? (
        <p role="alert" className="text-sm text-alarm">
          {result.error}
        </p>
      ) : options && data ? (
        <>
          {'note' in result && result.note ? <p className="text-sm text-ink-soft" data-testid="spectrum-note">{result.note}</p> : null}
          <Plot options={options} data={data} label={`Reflectance and transmittance of ${sources.map((x) => x.label).join(' and ')}`} heightPx={300} />
        </>
      ) : null}
      <p className="text-xs text-ink-faint">R solid, T dashed; R on the left axis, T on the right. Computed by the characteristic-matrix method in your browser.</p>
    </div>
  );
}
