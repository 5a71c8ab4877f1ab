import type { Comparison, Selection } from './loadComparison';
import { metricInfo, modeLabels } from './metrics';

const field = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1 text-sm';
const label = 'block text-xs uppercase tracking-wider text-ink-faint';

/** The selection as a plain GET form: submitting it rewrites the URL, so every view can be shared. */
export function Filters({ c, s }: { c: Comparison; s: Selection }) {
  const design = c.designs.find((d) => d.id === s.designId);
  const layerCount = c.layers.length ? Math.max(...c.layers.map((l) => l.layer)) : 1;
  return (
    <form method="get" action="/compare" className="grid gap-4 text-sm md:grid-cols-4" data-testid="compare-filters">
      <label className="md:col-span-2">
        <span className={label}>Design</span>
        <select name="design" defaultValue={s.designId} className={`${field} w-full`}>
          {c.designs.map((d) => (
            <option key={d.id} value={d.id}>
              {d.name} ({d.runs} runs)
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className={label}>Revision</span>
        <select name="rev" defaultValue={String(s.rev)} className={`${field} w-full`}>
          <option value="all">all revisions</option>
          {design?.revisions.map((r) => (
            <option key={r} value={r}>
              revision {r}
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className={label}>Analysis</span>
        <select name="mode" defaultValue={s.mode} className={`${field} w-full`}>
          {(['refit', 'sequential'] as const).map((m) => (
            <option key={m} value={m}>
              {modeLabels[m]}
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className={label}>Runs started from</span>
        <input type="date" name="from" defaultValue={s.from} className={`${field} w-full`} />
      </label>
      <label>
        <span className={label}>to (inclusive)</span>
        <input type="date" name="to" defaultValue={s.to} className={`${field} w-full`} />
      </label>
      <fieldset>
        <legend className={label}>Chambers (none ticked = all)</legend>
        {c.chambers.map((ch) => (
          <label key={ch.id} className="mr-3 inline-flex items-center gap-1 whitespace-nowrap">
            <input type="checkbox" name="chamber" value={ch.id} defaultChecked={s.chamberIds.includes(ch.id)} /> {ch.name}
          </label>
        ))}
      </fieldset>
      <fieldset>
        <legend className={label}>Shifts (none ticked = all)</legend>
        {c.shiftNames.map((sh) => (
          <label key={sh} className="mr-3 inline-flex items-center gap-1">
            <input type="checkbox" name="shift" value={sh} defaultChecked={s.shifts.includes(sh)} /> {sh}
          </label>
        ))}
      </fieldset>
      <label>
        <span className={label}>Figure for groups and chart</span>
        <select name="metric" defaultValue={s.metric} className={`${field} w-full`}>
          {(['cut', 'thickness', 'index'] as const).map((m) => (
            <option key={m} value={m}>
              {metricInfo[m].label} ({metricInfo[m].unit})
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className={label}>Control chart layer</span>
        <select name="layer" defaultValue={s.layer} className={`${field} w-full`}>
          {Array.from({ length: Math.max(layerCount, s.layer) }, (_, i) => i + 1).map((l) => (
            <option key={l} value={l}>
              layer {l}
            </option>
          ))}
        </select>
      </label>
      <label>
        <span className={label}>Baseline from</span>
        <input type="date" name="bfrom" defaultValue={s.bfrom} className={`${field} w-full`} />
      </label>
      <label>
        <span className={label}>Baseline to</span>
        <input type="date" name="bto" defaultValue={s.bto} className={`${field} w-full`} />
      </label>
      <div className="flex items-end md:col-span-4">
        <button type="submit" className="rounded-md bg-fringe px-4 py-1.5 text-sm font-medium text-paper-raised hover:bg-fringe-dark">
          Show
        </button>
      </div>
    </form>
  );
}
