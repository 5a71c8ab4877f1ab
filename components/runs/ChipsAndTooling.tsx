import { fixed, signed } from './format';

export type ChipView = {
  chip: number; gain: number; offset: number; noiseSigma: number; source: string; refinedGain?: number; refinedGainSigma?: number; gainDriftPerHour?: number; gainDriftSigmaPerHour?: number;
  offsetSigma?: number; offsetSource?: string;
};

/** Where a chip's detector offset came from, in words (the analysis's offsetSource). */
export function offsetOrigin(source: string | undefined): string | null {
  switch (source) {
    case 'dark': return 'dark readings';
    case 'fitted': return 'fitted to the layers';
    case 'averaged': return 'fitted to the layers, averaged with the one assumed';
    case 'earlier-chip': return 'an earlier chip';
    case 'other-chips': return "other chips' dark readings";
    case 'assumed': return 'assumed zero';
    default: return null;
  }
}
export type ToolingView = { material: string; label: string; layers: number[]; meanRatio: number; ratioSigma: number };

const th = 'pb-2 pr-3 font-medium';

/** Detector gain, offset and noise of each witness chip. */
export function ChipTable({ chips }: { chips: ChipView[] }) {
  if (chips.length === 0) return <p className="text-sm text-ink-soft">No chip calibration stored.</p>;
  return (
    <table className="w-full text-left text-sm" data-testid="chip-table">
      <thead className="text-xs uppercase tracking-wider text-ink-faint">
        <tr>
          <th className={th}>Chip</th>
          <th className={`${th} text-right`}>Gain</th>
          <th className={`${th} text-right`}>Offset</th>
          <th className={`${th} text-right`}>Noise <span className="normal-case">σ</span></th>
          <th className="pb-2 font-medium">From</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-line">
        {chips.map((c) => (
          <tr key={c.chip}>
            <td className="py-1.5 pr-3 font-mono">{c.chip}</td>
            <td className="py-1.5 pr-3 text-right font-mono">
              {fixed(c.refinedGain ?? c.gain, 4)}
              {c.gainDriftPerHour !== undefined ? <span className="block text-xs text-ink-faint">{signed(c.gainDriftPerHour * 100, 2)} %/h</span> : null}
            </td>
            <td className="py-1.5 pr-3 text-right font-mono">
              {fixed(c.offset, 4)}
              {c.offsetSigma ? <span className="text-ink-faint"> ± {fixed(c.offsetSigma, 4)}</span> : null}
              {offsetOrigin(c.offsetSource) ? <span className="block font-sans text-xs text-ink-faint">{offsetOrigin(c.offsetSource)}</span> : null}
            </td>
            <td className="py-1.5 pr-3 text-right font-mono">{fixed(c.noiseSigma, 5)}</td>
            <td className="py-1.5 text-xs text-ink-soft">{c.source === 'bare-chip' ? 'bare chip' : 'first layer'}{c.refinedGain !== undefined ? ', refined' : ''}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Optical thickness against the crystal's reading, per material: the tooling factor check. */
export function ToolingList({ tooling }: { tooling: ToolingView[] }) {
  if (tooling.length === 0) return <p className="text-sm text-ink-soft">The trace has no crystal_nm column, so there is no tooling check.</p>;
  return (
    <table className="w-full text-left text-sm" data-testid="tooling-table">
      <thead className="text-xs uppercase tracking-wider text-ink-faint">
        <tr>
          <th className={th}>Material</th>
          <th className={`${th} text-right`}>Optical ÷ crystal<span className="block normal-case tracking-normal">mean ± sd</span></th>
          <th className="pb-2 font-medium">Layers</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-line">
        {tooling.map((t) => (
          <tr key={t.material}>
            <td className="py-1.5 pr-3">{t.label}</td>
            <td className="py-1.5 pr-3 text-right font-mono whitespace-nowrap">{fixed(t.meanRatio, 4)} <span className="text-ink-faint">± {fixed(t.ratioSigma, 4)}</span></td>
            <td className="py-1.5 font-mono text-xs break-all text-ink-soft">{t.layers.join(', ')}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
