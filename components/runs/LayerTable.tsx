import { fixed, signed } from './format';

export type LayerRowView = {
  layer: number;
  material: string;
  chip: number | null;
  designThicknessNm: number | null;
  thicknessNm: number;
  thicknessSigmaNm: number;
  index: number;
  indexSigma: number;
  indexHeld: boolean;
  rateNmPerS: number;
  cutErrorQwotPct: number;
  /** When the layer was cut, s from the start of the trace. */
  cutTimeS: number | null;
  /** When it should have been cut: the modelled turning point, or the target reached on a level cut. */
  idealCutTimeS: number | null;
  residualRms: number;
  warnings: string[];
};

/** |cut error| at or above this (% QWOT) is marked; the analysis warns from 2 % by default. */
const CUT_MARK_PCT = 2;

export function LayerTable({ layers }: { layers: LayerRowView[] }) {
  const chips = new Set(layers.map((l) => l.chip));
  const showChip = chips.size > 1;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" data-testid="layer-table">
        <thead className="text-xs uppercase tracking-wider text-ink-faint">
          <tr className="align-bottom">
            <th className="pb-2 pr-3 font-medium">Layer</th>
            {showChip ? <th className="pb-2 pr-3 font-medium">Chip</th> : null}
            <th className="pb-2 pr-3 font-medium">Material</th>
            <th className="pb-2 pr-3 text-right font-medium">Design<span className="block normal-case tracking-normal">nm</span></th>
            <th className="pb-2 pr-3 text-right font-medium">Thickness<span className="block normal-case tracking-normal">nm ± σ</span></th>
            <th className="pb-2 pr-3 text-right font-medium">Index<span className="block normal-case tracking-normal">± σ</span></th>
            <th className="pb-2 pr-3 text-right font-medium">Rate<span className="block normal-case tracking-normal">nm/s</span></th>
            <th className="pb-2 pr-3 text-right font-medium">Cut error<span className="block normal-case tracking-normal">% QWOT</span></th>
            <th className="pb-2 pr-3 text-right font-medium" title="When the layer was cut, and when the fit says it should have been (turning point or target level), seconds into the trace">Cut at<span className="block normal-case tracking-normal">s · should be</span></th>
            <th className="pb-2 pr-3 text-right font-medium">Residual RMS<span className="block normal-case tracking-normal">of full scale</span></th>
            <th className="pb-2 font-medium">Notes</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-line">
          {layers.map((l) => (
            <tr key={l.layer} data-layer={l.layer} className="align-top">
              <td className="py-2 pr-3 font-mono">{l.layer}</td>
              {showChip ? <td className="py-2 pr-3 font-mono text-ink-soft">{l.chip ?? '–'}</td> : null}
              <td className="py-2 pr-3">{l.material}</td>
              <td className="py-2 pr-3 text-right font-mono text-ink-soft">{fixed(l.designThicknessNm, 2)}</td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.thicknessNm, 2)} <span className="text-ink-faint">± {fixed(l.thicknessSigmaNm, 2)}</span>
              </td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.index, 4)} {l.indexHeld ? <span className="text-xs text-ink-faint">held</span> : <span className="text-ink-faint">± {fixed(l.indexSigma, 4)}</span>}
              </td>
              <td className="py-2 pr-3 text-right font-mono">{fixed(l.rateNmPerS, 3)}</td>
              <td className={`py-2 pr-3 text-right font-mono ${Math.abs(l.cutErrorQwotPct) >= CUT_MARK_PCT ? 'font-semibold text-alarm' : ''}`}>{signed(l.cutErrorQwotPct, 2)}</td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.cutTimeS, 1)} <span className="text-ink-faint">· {fixed(l.idealCutTimeS, 1)}</span>
              </td>
              <td className="py-2 pr-3 text-right font-mono">{fixed(l.residualRms, 5)}</td>
              <td className="py-2 text-xs text-ink-soft">
                {l.warnings.length ? (
                  <ul className="flex max-w-sm flex-col gap-1">
                    {l.warnings.map((w, i) => (
                      <li key={i}>{w}</li>
                    ))}
                  </ul>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
