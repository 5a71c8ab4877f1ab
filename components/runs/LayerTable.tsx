'use client';

import { fixed, signed } from './format';
import { gradeLooks } from './cutGrade';
import type { LayerView } from './layerView';

export type { LayerView };

function CutError({ l, large = false }: { l: LayerView; large?: boolean }) {
  const look = gradeLooks[l.cutGrade];
  return (
    <span className={`whitespace-nowrap font-mono ${look.text} ${large ? 'text-lg font-semibold' : l.cutGrade === 'within' ? '' : 'font-semibold'}`} title={`${look.word} (limit ±${fixed(l.cutLimitQwotPct, 1)} % QWOT)`}>
      <span aria-hidden="true" className="mr-1 text-xs">{look.glyph}</span>
      {signed(l.cutErrorQwotPct, 2)}
      {l.cutErrorSigmaQwotPct !== null ? <span className="font-normal text-ink-faint"> ± {fixed(l.cutErrorSigmaQwotPct, 2)}</span> : null}
      <span className="sr-only"> % QWOT, {look.word}</span>
    </span>
  );
}

/** "2.3 s late", "0.4 s early", "on time". */
export function cutTiming(deltaS: number | null): string {
  if (deltaS === null) return '–';
  if (Math.abs(deltaS) < 0.05) return 'on time';
  return `${fixed(Math.abs(deltaS), 1)} s ${deltaS > 0 ? 'late' : 'early'}`;
}

export function monitorSetup(l: LayerView): string {
  const cut = l.cut === 'level' ? 'level cut' : l.cut === 'turning-point' ? 'turning-point cut' : '';
  return [l.monitorMode && l.wavelengthNm ? `${l.monitorMode} at ${l.wavelengthNm} nm` : null, cut || null, l.chip !== null ? `chip ${l.chip}` : null].filter(Boolean).join(' · ');
}

function Notes({ l }: { l: LayerView }) {
  const notes = [...(l.modesDisagree ? [`the two analysis modes disagree: ${fixed(l.thicknessNm, 2)} against ${fixed(l.otherModeThicknessNm, 2)} nm, beyond twice their σ`] : []), ...l.warnings];
  if (notes.length === 0) return null;
  return (
    <details className="text-xs">
      <summary className="cursor-pointer text-ink-soft" title={notes.join('\n')}>
        <span aria-hidden="true">✎ </span>
        {notes.length} note{notes.length > 1 ? 's' : ''}
        {l.modesDisagree ? <span className="ml-1 rounded bg-brass-light px-1 text-brass-dark">modes differ</span> : null}
      </summary>
      <ul className="mt-1 flex max-w-xs flex-col gap-1 text-ink-soft">
        {notes.map((w, i) => (
          <li key={i}>{w}</li>
        ))}
      </ul>
    </details>
  );
}

const Sub = ({ children }: { children: React.ReactNode }) => <span className="block text-xs font-normal normal-case tracking-normal text-ink-faint">{children}</span>;

/** "graded Δn +0.0200 ± 0.0014" (bottom to top), or the trial's figures for a layer fitted uniform. */
export function gradientText(g: NonNullable<LayerView['indexGradient']>): string {
  const value = `Δn ${signed(g.deltaN, 4)}${g.sigma !== null ? ` ± ${fixed(g.sigma, 4)}` : ''}`;
  return g.kept ? `graded ${value}` : `uniform (trial ${value})`;
}

function Gradient({ l }: { l: LayerView }) {
  if (!l.indexGradient) return null;
  return <span className="block text-xs text-ink-faint" title="index change from the layer's bottom to its top">{gradientText(l.indexGradient)}</span>;
}

/**
 * The layers, arranged by the questions asked of them: was each cut on target (the operator),
 * what film went down (the engineer), and can the fit be trusted (everyone who signs off).
 * One card a layer on a phone, the cut error first.
 */
export function LayerTable({ layers, selected = null, onSelect }: { layers: LayerView[]; selected?: number | null; onSelect?: (layer: number) => void }) {
  const pick = (layer: number) => onSelect?.(layer);
  const name = (l: LayerView) => (l.materialName ? `${l.material} · ${l.materialName}` : l.material);
  return (
    <>
      <table className="hidden w-full text-left text-sm md:table" data-testid="layer-table">
        <thead className="text-xs text-ink-faint">
          <tr>
            <th className="pb-1" />
            <th colSpan={2} className="border-b border-paper-line pb-1 pr-3 font-medium">Was the cut on target?</th>
            <th colSpan={3} className="border-b border-paper-line pb-1 pr-3 font-medium">What film went down?</th>
            <th colSpan={2} className="border-b border-paper-line pb-1 font-medium">Does the fit hold?</th>
          </tr>
          <tr className="align-bottom uppercase tracking-wider">
            <th className="py-2 pr-3 font-medium">Layer</th>
            <th className="py-2 pr-3 text-right font-medium">Cut error<Sub>% QWOT ± σ</Sub></th>
            <th className="py-2 pr-3 font-medium">Cut came</th>
            <th className="py-2 pr-3 text-right font-medium">Thickness<Sub>nm ± σ · Δ design</Sub></th>
            <th className="py-2 pr-3 text-right font-medium">Index<Sub>at the monitor λ · Δ nominal</Sub></th>
            <th className="py-2 pr-3 text-right font-medium">Rate<Sub>nm/s · drift nm/s²</Sub></th>
            <th className="py-2 pr-3 text-right font-medium">Residual<Sub>× noise</Sub></th>
            <th className="py-2 font-medium">Notes</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-line">
          {layers.map((l) => (
            <tr key={l.layer} data-layer={l.layer} aria-selected={selected === l.layer} onClick={() => pick(l.layer)} className={`cursor-pointer align-top hover:bg-paper-sunk/60 ${selected === l.layer ? 'bg-fringe-light/60' : ''}`}>
              <td className="py-2 pr-3">
                <button type="button" onClick={(e) => (e.stopPropagation(), pick(l.layer))} className="font-mono font-semibold text-fringe hover:underline" aria-label={`Show layer ${l.layer} on the trace`}>
                  {l.layer}
                </button>{' '}
                <span>{name(l)}</span>
                <Sub>{monitorSetup(l)}</Sub>
              </td>
              <td className="py-2 pr-3 text-right"><CutError l={l} /></td>
              <td className="py-2 pr-3 whitespace-nowrap">{cutTiming(l.cutDeltaS)}</td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.thicknessNm, 2)} <span className="text-ink-faint">± {fixed(l.thicknessSigmaNm, 2)}</span>
                <Sub>{l.thicknessDeltaPct === null ? '–' : `${signed(l.thicknessDeltaPct, 2)} % of ${fixed(l.designThicknessNm, 1)}`}</Sub>
              </td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.index, 4)} {l.indexHeld ? <span className="text-xs text-ink-faint">held</span> : <span className="text-ink-faint">± {fixed(l.indexSigma, 4)}</span>}
                <Sub>{signed(l.indexDeviation, 4)}</Sub>
                <Gradient l={l} />
              </td>
              <td className="py-2 pr-3 text-right font-mono whitespace-nowrap">
                {fixed(l.rateNmPerS, 3)}
                <Sub>{l.rateDriftNmPerS2 === null ? '–' : `${signed(l.rateDriftNmPerS2 * 1000, 2)}·10⁻³`}</Sub>
              </td>
              <td className="py-2 pr-3 text-right font-mono">{l.residualToNoise === null ? fixed(l.residualRms, 5) : `${fixed(l.residualToNoise, 1)}×`}</td>
              <td className="py-2"><Notes l={l} /></td>
            </tr>
          ))}
        </tbody>
      </table>
      <ol className="flex flex-col gap-3 md:hidden" data-testid="layer-cards">
        {layers.map((l) => (
          <li key={l.layer} data-layer={l.layer} className={`rounded-md border p-3 ${selected === l.layer ? 'border-fringe bg-fringe-light/50' : 'border-paper-line bg-paper-raised'}`}>
            <div className="flex items-baseline justify-between gap-2">
              <CutError l={l} large />
              <span className="text-sm text-ink-soft">{cutTiming(l.cutDeltaS)}</span>
            </div>
            <button type="button" onClick={() => pick(l.layer)} className="mt-1 text-left text-sm font-medium text-fringe" aria-label={`Show layer ${l.layer} on the trace`}>
              Layer {l.layer} · {name(l)}
            </button>
            <p className="text-xs text-ink-faint">{monitorSetup(l)}</p>
            <dl className="mt-2 grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
              <dt className="text-ink-faint">Thickness</dt>
              <dd className="font-mono">{fixed(l.thicknessNm, 1)} nm <span className="text-ink-faint">({signed(l.thicknessDeltaPct, 1)} %)</span></dd>
              <dt className="text-ink-faint">Index</dt>
              <dd className="font-mono">{fixed(l.index, 4)} {l.indexHeld ? <span className="text-ink-faint">held</span> : null}<Gradient l={l} /></dd>
              <dt className="text-ink-faint">Rate</dt>
              <dd className="font-mono">{fixed(l.rateNmPerS, 3)} nm/s</dd>
              <dt className="text-ink-faint">Residual</dt>
              <dd className="font-mono">{l.residualToNoise === null ? '–' : `${fixed(l.residualToNoise, 1)}× noise`}</dd>
            </dl>
            <div className="mt-2"><Notes l={l} /></div>
          </li>
        ))}
      </ol>
    </>
  );
}
