import { fixed, signed } from './format';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'material', label: 'Material' },
  { key: 'layers', label: 'Layers' },
  { key: 'mean', label: 'Offset at mid-run', right: true },
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

/**
 * How the stored drift's line was drawn (analysis/stats/indexDrift.ts); an analysis stored before
 * the drift was weighted has none and drew an unweighted line.
 */
export type DriftMethod = 'random-effects' | 'weighted' | 'unweighted';

export type DriftView = {
  material: string; layers: number[]; meanDeviation: number | null; slopePerHour: number | null; slopeSigmaPerHour: number | null;
  method?: DriftMethod;
};

const methodText: Record<DriftMethod, string> = {
  'random-effects': 'each layer weighted by 1/(σ² + τ²), τ the layers’ spread about the line read from the run (as in the pooled-index note)',
  weighted: 'fewer than five layers: each weighted by 1/σ², σ widened where they scatter beyond it',
  unweighted: 'unweighted (an analysis stored before the drift was weighted, or a layer without a σ; analyse again to weigh it)',
};

/** The line's description under the table: one sentence per way the materials' lines were drawn. */
export function driftMethodNote(drift: readonly Pick<DriftView, 'material' | 'method'>[]): string {
  const by = new Map<DriftMethod, string[]>();
  for (const d of drift) {
    const m = d.method ?? 'unweighted';
    by.set(m, [...(by.get(m) ?? []), d.material]);
  }
  const parts = [...by.entries()].map(([m, materials]) => (by.size > 1 ? `${materials.join(', ')}: ${methodText[m]}` : methodText[m]));
  return parts.length ? `Trend: the line through each layer’s own reading, ${parts.join('; ')}.` : '';
}

export function IndexDriftList({ drift }: { drift: DriftView[] }) {
  if (drift.length === 0) return <p className="text-sm text-ink-soft">No fitted index to compare.</p>;
  return (
    <>
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
      <p className="mt-1 text-xs text-ink-soft" data-testid="drift-method">{driftMethodNote(drift)}</p>
    </>
  );
}
