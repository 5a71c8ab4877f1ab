import { fixed, signed } from './format';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'material', label: 'Material' },
  { key: 'layers', label: 'Layers' },
  { key: 'mean', label: 'Mean index offset', right: true },
  {
    key: 'trend',
    label: (
      <>
        Trend per hour<span className="block normal-case tracking-normal">± σ</span>
      </>
    ),
    right: true,
  },
];

export type DriftView = { material: string; layers: number[]; meanDeviation: number | null; slopePerHour: number | null; slopeSigmaPerHour: number | null };

export function IndexDriftList({ drift }: { drift: DriftView[] }) {
  if (drift.length === 0) return <p className="text-sm text-ink-soft">No fitted index to compare.</p>;
  return (
    <DataTable columns={columns} gap="pr-3">
      {drift.map((d) => (
        <tr key={d.material}>
          <td className="py-2 pr-3">{d.material}</td>
          <td className="py-2 pr-3 font-mono text-xs text-ink-soft">{d.layers.join(', ')}</td>
          <td className="py-2 pr-3 text-right font-mono">{signed(d.meanDeviation, 4)}</td>
          <td className="py-2 text-right font-mono whitespace-nowrap">
            {d.slopePerHour === null ? '–' : `${signed(d.slopePerHour, 4)} ± ${fixed(d.slopeSigmaPerHour, 4)}`}
          </td>
        </tr>
      ))}
    </DataTable>
  );
}
