import { type PlanLayer } from '@/analysis/design';
import { fixed } from '@/components/runs/format';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'layer', label: 'Layer' },
  { key: 'material', label: 'Material' },
  { key: 'thickness', label: 'Thickness nm', right: true },
  { key: 'monitor', label: 'Monitor' },
  { key: 'cut', label: 'Cut' },
  {
    key: 'qw',
    label: (
      <>
        QW at <span className="normal-case">λ</span> mon.
      </>
    ),
    right: true,
  },
  { key: 'tps', label: <abbr title="turning points passed in the layer, one at its end included">TPs</abbr>, right: true },
  { key: 'signal', label: 'Signal start → cut', right: true },
  { key: 'swing', label: 'Swing %', right: true },
  { key: 'slope', label: 'Slope at cut /nm', right: true },
  {
    key: 'shift',
    label: (
      <>
        0.1 % signal error
        <span className="block normal-case tracking-normal">moves the cut by</span>
      </>
    ),
    right: true,
  },
];

/** A monitor-signal error of 0.1 % of full scale (0.001 as a fraction). */
export const SIGNAL_ERROR = 0.001;

/** How far (nm) a signal error of SIGNAL_ERROR moves a cut made at this slope; null at a turning point. */
export function cutShiftNm(slopePerNm: number): number | null {
  const a = Math.abs(slopePerNm);
  return a > 1e-9 ? SIGNAL_ERROR / a : null;
}

export function CutPlanTable({ plan }: { plan: PlanLayer[] }) {
  const warnings = plan.flatMap((l) => l.warnings.map((w) => ({ layer: l.layer, ...w })));
  return (
    <div className="flex flex-col gap-3">
      <DataTable columns={columns} testId="cut-plan" gap="pr-3" nowrapHeadings>
        {plan.map((l) => {
          const shift = cutShiftNm(l.slopePerNm);
          const qwNm = l.thicknessNm / l.qwotAtMonitor;
          return (
            <tr key={l.layer} data-plan-layer={l.layer} className={l.warnings.length ? 'bg-brass-light/50' : undefined}>
              <td className="py-1.5 pr-3 font-mono">{l.layer}</td>
              <td className="py-1.5 pr-3">{l.material}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.thicknessNm, 2)}</td>
              <td className="py-1.5 pr-3 whitespace-nowrap">
                {l.mode} at {fixed(l.wavelengthNm, 0)} nm, chip {l.chip}
              </td>
              <td className="py-1.5 pr-3 whitespace-nowrap">{l.cut === 'level' ? 'at a level' : 'turning point'}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.qwotAtMonitor, 3)}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{l.turningPoints}</td>
              <td className="py-1.5 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.startSignal, 4)} → {fixed(l.cutSignal, 4)}
              </td>
              <td className="py-1.5 pr-3 text-right font-mono">{fixed(l.swingPct, 1)}</td>
              <td className="py-1.5 pr-3 text-right font-mono">{l.slopePerNm.toExponential(2).replace(/-/g, '−')}</td>
              <td className="py-1.5 pr-3 text-right font-mono whitespace-nowrap">
                {shift === null ? (
                  <span className="text-ink-faint">at the extremum</span>
                ) : (
                  <>
                    {fixed(shift, 2)} nm <span className="text-ink-faint">· {fixed((100 * shift) / qwNm, 1)} % QW</span>
                  </>
                )}
              </td>
            </tr>
          );
        })}
      </DataTable>
      {warnings.length ? (
        <ul className="flex flex-col gap-1 text-sm" data-testid="plan-warnings">
          {warnings.map((w, i) => (
            <li key={i} className="rounded border border-brass/40 bg-brass-light px-3 py-1.5">
              {w.message}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-ink-soft">No warnings for this plan.</p>
      )}
      <p className="text-xs text-ink-faint">
        Signals are fractions of full scale from the design model. At a turning point the slope is zero, so a level error does not move the cut; the
        error there is in finding the extremum. Thresholds for warnings are common practice, not a standard.
      </p>
    </div>
  );
}
