import { defaultBand, SINGLE_LAYER_RULE_SOURCE, type SingleLayerRule } from '@/analysis/design';
import { fixed } from '@/components/runs/format';

const pct = (v: number) => `${fixed(100 * v, 2)} %`;

/** The band is narrower than the default one: a material's table or model covers less of it. */
const narrowed = (rule: SingleLayerRule) => {
  const band = defaultBand(rule.wavelengthNm);
  return rule.band.fromNm > band.fromNm || rule.band.toNm < band.toNm;
};

/** The single quarter-wave AR rule with the design's own numbers, beside what the design reaches. */
export function SingleLayerRulePanel({ rule }: { rule: SingleLayerRule }) {
  const row = 'flex justify-between gap-4 py-1.5';
  return (
    <div className="grid gap-6 md:grid-cols-2" data-testid="single-layer-rule">
      <div>
        <h3 className="mb-2 text-sm font-semibold">One quarter-wave layer at {fixed(rule.wavelengthNm, 0)} nm</h3>
        <dl className="divide-y divide-paper-line text-sm">
          <div className={row}>
            <dt>Ambient n₀ · substrate n_s</dt>
            <dd className="font-mono">
              {fixed(rule.ambientIndex, 4)} · {fixed(rule.substrateIndex, 4)}
            </dd>
          </div>
          <div className={row}>
            <dt>Ideal index √(n₀·n_s)</dt>
            <dd className="font-mono" data-testid="rule-ideal-index">
              {fixed(rule.idealIndex, 4)}
            </dd>
          </div>
          <div className={row}>
            <dt>Low-index material used</dt>
            <dd className="font-mono">
              {rule.lowMaterial}, n₁ = {fixed(rule.lowIndex, 4)}
            </dd>
          </div>
          <div className={row}>
            <dt>Its quarter-wave thickness λ/(4n₁)</dt>
            <dd className="font-mono">{fixed(rule.quarterWaveNm, 2)} nm</dd>
          </div>
          <div className={row}>
            <dt>Residual R ((n₀n_s − n₁²)/(n₀n_s + n₁²))²</dt>
            <dd className="font-mono" data-testid="rule-residual">
              {pct(rule.residualR)}
            </dd>
          </div>
          <div className={row}>
            <dt>Bare front face ((n₀ − n_s)/(n₀ + n_s))²</dt>
            <dd className="font-mono">{pct(rule.bareR)}</dd>
          </div>
        </dl>
      </div>
      <div>
        <h3 className="mb-2 text-sm font-semibold">This design</h3>
        <dl className="divide-y divide-paper-line text-sm">
          <div className={row}>
            <dt>R at {fixed(rule.wavelengthNm, 0)} nm</dt>
            <dd className="font-mono" data-testid="rule-design-r">
              {pct(rule.designRAtRef)}
            </dd>
          </div>
          <div className={row}>
            <dt>
              Mean R, {fixed(rule.band.fromNm, 0)}–{fixed(rule.band.toNm, 0)} nm
            </dt>
            <dd className="font-mono">{pct(rule.band.meanR)}</dd>
          </div>
          <div className={row}>
            <dt>Highest R in that band</dt>
            <dd className="font-mono">{pct(rule.band.maxR)}</dd>
          </div>
        </dl>
        <p className="mt-3 text-xs text-ink-faint">
          Front face only, normal incidence, like the rule. The band is 0.8 to 1.25 times the reference wavelength (common practice for an AR
          about its centre){narrowed(rule) ? ', narrowed to where every material of the design has an index' : ''}.
        </p>
      </div>
      <p className="text-xs text-ink-soft md:col-span-2">Formulas: {SINGLE_LAYER_RULE_SOURCE}</p>
    </div>
  );
}
