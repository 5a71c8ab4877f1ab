import { fixed, signed } from './format';
import { gradeLooks } from './cutGrade';
import type { LayerView } from './layerView';

const th = 'border-b border-ink/40 px-1.5 py-1 text-left align-bottom text-[11px] font-semibold';
const td = 'border-b border-paper-line px-1.5 py-1 align-top font-mono text-[11px] whitespace-nowrap';

/**
 * The results table of the printable report: one row a layer, every figure with its σ, the cut
 * error graded by word and shape beside its colour, so it reads on a grey-scale printer too.
 */
export function ReportLayerTable({ layers }: { layers: LayerView[] }) {
  return (
    <div className="overflow-x-auto print:overflow-visible">
    <table className="w-full border-collapse" data-testid="report-layers">
      <thead>
        <tr>
          <th className={th}>Layer</th>
          <th className={th}>Design, nm</th>
          <th className={th}>Deposited, nm ± σ</th>
          <th className={th}>Δ vs design</th>
          <th className={th}>Index ± σ at monitor λ</th>
          <th className={th}>Rate, nm/s</th>
          <th className={th}>Cut error, % QWOT ± σ</th>
        </tr>
      </thead>
      <tbody>
        {layers.map((l) => {
          const look = gradeLooks[l.cutGrade];
          return (
            <tr key={l.layer} data-layer={l.layer} className="break-inside-avoid">
              <td className={td}>
                {l.layer} <span className="font-sans">{l.material}{l.materialName ? ` · ${l.materialName}` : ''}</span>
              </td>
              <td className={td}>{fixed(l.designThicknessNm, 1)}</td>
              <td className={td}>{fixed(l.thicknessNm, 2)} ± {fixed(l.thicknessSigmaNm, 2)}</td>
              <td className={td}>{l.thicknessDeltaPct === null ? '–' : `${signed(l.thicknessDeltaPct, 2)} %`}</td>
              <td className={td}>
                {fixed(l.index, 4)} ± {fixed(l.indexSigma, 4)}
                <span className="block font-sans text-ink-faint">{l.wavelengthNm !== null ? `at ${l.wavelengthNm} nm` : 'λ not recorded'}{l.indexHeld ? ', held' : ''}</span>
              </td>
              <td className={td}>{fixed(l.rateNmPerS, 4)}{l.rateSigmaNmPerS !== null ? ` ± ${fixed(l.rateSigmaNmPerS, 4)}` : ''}</td>
              <td className={td}>
                <span className={look.text}>
                  <span aria-hidden="true" className="mr-1">{look.glyph}</span>
                  {signed(l.cutErrorQwotPct, 2)}
                </span>
                {l.cutErrorSigmaQwotPct !== null ? ` ± ${fixed(l.cutErrorSigmaQwotPct, 2)}` : ''}
                <span className="block font-sans">{look.word}, limit ±{fixed(l.cutLimitQwotPct, 1)}</span>
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
    </div>
  );
}
