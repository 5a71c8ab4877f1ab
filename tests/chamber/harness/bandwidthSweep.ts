// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/bandwidthSweep.ts ['scenario name' | all] [seeds, e.g. 11-14] [FWHMs, e.g. 0,1,2,4]):
// the analysis (a single-wavelength model) on traces whose monitor passes a band (the simulator's
// option bandwidthNm: a triangular slit function of that FWHM, R or T averaged over it). Per
// scenario, mode and FWHM: the errors against the truth (max, RMS, mean signed) and 3σ coverage;
// then, paired with FWHM 0 on the same seeds (every other draw is the same), what the band alone
// moved: the mean and largest change of the thickness, index and cut errors, and the mean change
// by the layer's place on its chip (a bias that grows with the stack below shows there) and by
// material. 'all' (the default) runs the white-noise mirror, the white-noise BBAR level cuts and
// the 40-layer run. FRINGELOG_ACCURACY_OPTIONS sets analysis options as in the accuracy harness.
// The noise is drawn per sample, so once a cut moves by a sample every later layer meets other
// noise and the pairing holds only up to there: BANDWIDTH_QUIET=1 leaves out every draw per
// sample (white noise down to 1e-5 of full scale, no correlated noise, spikes, time jitter or
// rate wander), so the change paired with FWHM 0 is the band's systematic effect alone.
import { scenarios, type Mode, type Scenario } from '../scenarios';
import { layerErrors, summarize, type LayerError } from './accuracyTable';
import { runScenario } from './runScenario';
import { seedList } from './seedList';

const DEFAULT = ['white noise, mirror', 'white noise, BBAR level cuts', '40 layers, 5 chips, no chip column'];
const MODES: Mode[] = ['sequential', 'refit'];

interface Row extends LayerError {
  place: number;
  material: string;
}

const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
const maxAbs = (v: number[]) => v.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
const sgn = (v: number, d: number) => `${v >= 0 ? '+' : ''}${v.toFixed(d)}`;
const pct = (v: number | null) => (v === null ? '—' : (v * 100).toFixed(0));

async function main(): Promise<void> {
  const arg = process.argv[2] ?? 'all';
  const names = arg === 'all' ? DEFAULT : [arg];
  const widths = (process.argv[4] ?? '0,1,2,4').split(',').map(Number);
  if (widths[0] !== 0) widths.unshift(0);
  for (const name of names) {
    const found = scenarios().find((s) => s.name === name);
    if (!found) throw new Error(`no scenario named '${name}'`);
    const quiet = process.env.BANDWIDTH_QUIET === '1';
    const scenario: Scenario = quiet
      ? { ...found, options: { ...found.options, whiteNoise: 1e-5, correlatedNoise: undefined, spikes: undefined, jitterFraction: 0, rateWander: undefined } }
      : found;
    const seeds = seedList(process.argv[3], scenario.seeds);
    const t = scenario.targets;
    console.log(`== ${name}${quiet ? ' (no noise drawn per sample)' : ''} — seeds ${seeds.join(',')} — targets ${t.thicknessPct} %, ${t.index}, ${t.cutQwotPct} % QWOT`);
    const rows = new Map<number, Record<Mode, Row[]>>();
    for (const w of widths) {
      const s: Scenario = { ...scenario, options: { ...scenario.options, bandwidthNm: w || undefined } };
      const byMode: Record<Mode, Row[]> = { sequential: [], refit: [] };
      for (const seed of seeds) {
        const { run, results } = await runScenario(s, seed, MODES);
        const truth = run.truth.layers;
        for (const m of MODES) {
          byMode[m].push(...layerErrors(seed, results[m], truth).map((e) => {
            const l = truth.find((x) => x.layer === e.layer)!;
            return { ...e, place: e.layer - truth.find((x) => x.chip === l.chip)!.layer + 1, material: l.material };
          }));
        }
      }
      rows.set(w, byMode);
      for (const m of MODES) {
        const e = byMode[m];
        const su = summarize(e);
        const thick = e.filter((x) => x.qwot >= 0.5 && x.thicknessPct !== null);
        console.log(`${m.padEnd(10)} FWHM ${String(w).padStart(2)} nm: max|d| ${su.maxThicknessPct.toFixed(3)} % RMS ${su.rmsThicknessPct.toFixed(3)} mean ${sgn(mean(thick.map((x) => x.thicknessPct!)), 3)}`
          + `  max|n| ${su.maxIndex.toFixed(4)} RMS ${su.rmsIndex.toFixed(4)} mean ${sgn(mean(thick.map((x) => x.index!)), 4)}`
          + `  max|cut| ${su.maxCutQwotPct.toFixed(3)} % QWOT mean ${sgn(mean(e.filter((x) => x.cutQwotPct !== null).map((x) => x.cutQwotPct!)), 3)}`
          + `  thin max|nd| ${Number.isFinite(su.maxThinOpticalPct) ? su.maxThinOpticalPct.toFixed(3) : '—'} %`
          + `  3σ ${pct(su.coverage.thickness)}/${pct(su.coverage.index)}/${pct(su.coverage.cut)} %  missing ${su.missing}`);
      }
    }
    // paired with FWHM 0: the band's own effect
    const base = rows.get(0)!;
    for (const w of widths.slice(1)) {
      for (const m of MODES) {
        const pairs = rows.get(w)![m].flatMap((e, i) => {
          const b = base[m][i];
          return e.thicknessPct === null || b.thicknessPct === null ? [] : [{ e, dd: e.thicknessPct - b.thicknessPct, dn: e.index! - b.index!, dc: e.cutQwotPct! - b.cutQwotPct! }];
        });
        const by = <K>(key: (p: (typeof pairs)[number]) => K) => [...new Set(pairs.map(key))].sort((a, b) => (a < b ? -1 : 1)).map((k) => {
          const g = pairs.filter((p) => key(p) === k);
          return `${k}: ${sgn(mean(g.map((p) => p.dd)), 3)}/${sgn(mean(g.map((p) => p.dn)), 4)}`;
        }).join('  ');
        console.log(`  Δ vs 0, ${m.padEnd(10)} FWHM ${String(w).padStart(2)} nm: d mean ${sgn(mean(pairs.map((p) => p.dd)), 3)} max|${maxAbs(pairs.map((p) => p.dd)).toFixed(3)}| %`
          + `  n mean ${sgn(mean(pairs.map((p) => p.dn)), 4)} max|${maxAbs(pairs.map((p) => p.dn)).toFixed(4)}|  cut mean ${sgn(mean(pairs.map((p) => p.dc)), 3)} max|${maxAbs(pairs.map((p) => p.dc)).toFixed(3)}| % QWOT`);
        console.log(`      by place on chip (Δd % / Δn): ${by((p) => p.e.place)}`);
        // the largest single changes: a smooth bias moves every layer a little, a choice the
        // analysis makes (a start delay kept, a boundary, a wander) flipping moves one a lot
        const top = [...pairs].sort((a, b) => Math.abs(b.dd) - Math.abs(a.dd)).slice(0, 3);
        console.log(`      largest: ${top.map((p) => `s${p.e.seed} L${p.e.layer} Δd ${sgn(p.dd, 3)} % Δn ${sgn(p.dn, 4)} (d err ${sgn(p.e.thicknessPct!, 3)} %, z ${p.e.zThickness?.toFixed(1) ?? '—'})`).join('  ')}`);
        console.log(`      by material: ${by((p) => p.e.material)}`);
      }
    }
  }
}

void main();
