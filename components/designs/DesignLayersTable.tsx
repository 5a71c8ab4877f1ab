import { type Design } from '@/analysis/design';
import { fixed } from '@/components/runs/format';

/** The layers of a parsed design, read-only, with the tolerances each one ends up with. */
export function DesignLayersTable({ design }: { design: Design }) {
  const th = 'pb-2 pr-3 font-medium whitespace-nowrap';
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" data-testid="design-layers">
        <thead className="text-xs uppercase tracking-wider text-ink-faint">
          <tr>
            <th className={th}>Layer</th>
            <th className={th}>Material</th>
            <th className={`${th} text-right`}>Thickness nm</th>
            <th className={`${th} text-right`}>
              QWOT at <span className="normal-case">λ</span> ref
            </th>
            <th className={th}>Monitor</th>
            <th className={th}>Cut</th>
            <th className={`${th} text-right`}>± % thickness</th>
            <th className={`${th} text-right`}>± index</th>
            <th className={`${th} text-right`}>± % QWOT cut</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-line">
          {design.layers.map((l) => (
            <tr key={l.layer} data-layer={l.layer}>
              <td className="py-1.5 pr-3 font-mono">{l.layer}</td>
              <td className="py-1.5 pr-3">{l.material}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.thicknessNm, 2)}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.qwot, 3)}</td>
              <td className="py-1.5 pr-3 whitespace-nowrap">
                {l.monitor.mode} at {l.monitor.wavelengthNm} nm, chip {l.monitor.chip}
              </td>
              <td className="py-1.5 pr-3 whitespace-nowrap">{l.monitor.cut === 'level' ? 'at a level' : 'turning point'}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.tolerance.thicknessPct, 1)}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.tolerance.indexAbs, 3)}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.tolerance.cutErrorQwotPct, 1)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
