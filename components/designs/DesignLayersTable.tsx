import { type Design } from '@/analysis/design';
import { fixed } from '@/components/runs/format';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'layer', label: 'Layer' },
  { key: 'material', label: 'Material' },
  { key: 'thickness', label: 'Thickness nm', right: true },
  {
    key: 'qwot',
    label: (
      <>
        QWOT at <span className="normal-case">λ</span> ref
      </>
    ),
    right: true,
  },
  { key: 'monitor', label: 'Monitor' },
  { key: 'cut', label: 'Cut' },
  { key: 'tolD', label: '± % thickness', right: true },
  { key: 'tolN', label: '± index', right: true },
  { key: 'tolCut', label: '± % QWOT cut', right: true },
];

/** The layers of a parsed design, read-only, with the tolerances each one ends up with. */
export function DesignLayersTable({ design }: { design: Design }) {
  return (
    <DataTable columns={columns} testId="design-layers" gap="pr-3" nowrapHeadings>
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
    </DataTable>
  );
}
