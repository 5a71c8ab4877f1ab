'use client';

import { useMemo, useState } from 'react';
import type uPlot from 'uplot';
import { parseDesign } from '@/analysis/design';
import { Plot, axis, plotPalette } from '@/components/plot';
import { chipTrace } from './monitorTrace';

/** Rate assumed until the engineer gives the chamber's own (nm/s). */
const DEFAULT_RATE_NM_PER_S = 0.5;

/** Each witness chip's expected monitor curve against thickness or time, layer ends marked. */
export function MonitorCurves({ document }: { document: unknown }) {
  const design = useMemo(() => parseDesign(document), [document]);
  const chips = useMemo(() => [...new Set(design.layers.map((l) => l.monitor.chip))].sort((a, b) => a - b), [design]);
  const materials = useMemo(() => [...new Set(design.layers.map((l) => l.material))], [design]);
  const [chip, setChip] = useState(chips[0] ?? 1);
  const [xAxis, setXAxis] = useState<'thickness' | 'time'>('thickness');
  const [rates, setRates] = useState<Record<string, string>>(() => Object.fromEntries(materials.map((m) => [m, String(DEFAULT_RATE_NM_PER_S)])));

  const rateNumbers = useMemo(() => {
    const out: Record<string, number> = {};
    for (const m of materials) {
      const v = Number(rates[m]);
      out[m] = Number.isFinite(v) && v > 0 ? v : DEFAULT_RATE_NM_PER_S;
    }
    return out;
  }, [rates, materials]);
  const trace = useMemo(() => (chips.length ? chipTrace(design, chip, xAxis, rateNumbers) : null), [design, chip, xAxis, rateNumbers, chips.length]);

  const options = useMemo<Omit<uPlot.Options, 'width' | 'height'> | null>(() => {
    if (!trace) return null;
    const unit = xAxis === 'time' ? 's' : 'nm';
    return {
      scales: { x: { time: false } },
      axes: [axis(xAxis === 'time' ? 'Time (s)' : 'Deposited thickness on the chip (nm)'), axis('Signal (fraction)')],
      series: [
        { label: unit, value: (_u, v) => (v == null ? '–' : v.toFixed(1)) },
        { label: 'expected signal', stroke: plotPalette.model, width: 2, value: (_u, v) => (v == null ? '–' : v.toFixed(4)) },
      ],
      hooks: {
        draw: [
          (u: uPlot) => {
            const ctx = u.ctx;
            ctx.save();
            ctx.strokeStyle = plotPalette.cut;
            ctx.fillStyle = plotPalette.inkFaint;
            ctx.setLineDash([4, 4]);
            ctx.font = plotPalette.font;
            for (const b of trace.boundaries) {
              const px = u.valToPos(b.x, 'x', true);
              ctx.beginPath();
              ctx.moveTo(px, u.bbox.top);
              ctx.lineTo(px, u.bbox.top + u.bbox.height);
              ctx.stroke();
              ctx.fillText(String(b.layer), px - 12 * devicePixelRatio, u.bbox.top + 12 * devicePixelRatio);
            }
            ctx.restore();
          },
        ],
      },
    };
  }, [trace, xAxis]);

  if (!trace || !options) return <p className="text-ink-soft">This design has no layers.</p>;
  const field = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1 text-sm';
  return (
    <div className="flex flex-col gap-3" data-testid="monitor-curves">
      <div className="flex flex-wrap items-end gap-3 text-sm">
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Witness chip</span>
          <select className={field} value={chip} onChange={(e) => setChip(Number(e.target.value))}>
            {chips.map((c) => (
              <option key={c} value={c}>
                chip {c} (layers {design.layers.filter((l) => l.monitor.chip === c).map((l) => l.layer).join(', ')})
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Against</span>
          <select className={field} value={xAxis} onChange={(e) => setXAxis(e.target.value as 'thickness' | 'time')}>
            <option value="thickness">thickness</option>
            <option value="time">time</option>
          </select>
        </label>
        {xAxis === 'time'
          ? materials.map((m) => (
              <label key={m} className="flex flex-col gap-1">
                <span className="text-ink-soft">Rate of {m} (nm/s)</span>
                <input className={`${field} w-24`} inputMode="decimal" value={rates[m] ?? ''} onChange={(e) => setRates((r) => ({ ...r, [m]: e.target.value }))} />
              </label>
            ))
          : null}
      </div>
      <Plot options={options} data={[trace.x, trace.signal]} label={`Expected monitor signal of chip ${chip}, layers ${trace.layers.join(', ')}`} heightPx={280} />
      <p className="text-xs text-ink-faint">
        Dashed lines mark where each layer ends (numbered). Against time, each material grows at the rate given here
        {xAxis === 'time' ? '' : ` (${DEFAULT_RATE_NM_PER_S} nm/s until you set your chamber's)`}.
      </p>
    </div>
  );
}
