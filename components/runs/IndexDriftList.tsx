import { fixed, signed } from './format';

export type DriftView = { material: string; layers: number[]; meanDeviation: number | null; slopePerHour: number | null; slopeSigmaPerHour: number | null };

export function IndexDriftList({ drift }: { drift: DriftView[] }) {
  if (drift.length === 0) return <p className="text-sm text-ink-soft">No fitted index to compare.</p>;
  return (
    <table className="w-full text-left text-sm">
      <thead className="text-xs uppercase tracking-wider text-ink-faint">
        <tr>
          <th className="pb-2 pr-3 font-medium">Material</th>
          <th className="pb-2 pr-3 font-medium">Layers</th>
          <th className="pb-2 pr-3 text-right font-medium">Mean index offset</th>
          <th className="pb-2 text-right font-medium">
            Trend per hour<span className="block normal-case tracking-normal">± σ</span>
          </th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-line">
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
      </tbody>
    </table>
  );
}
