import { type AnalysisResult } from '@/analysis/fit';
import { type LayerTruth } from '../options';
import { type Targets } from '../scenarios';

export interface LayerError {
  seed: number;
  layer: number;
  qwot: number;
  /** null when the analysis gave the layer no result. */
  thicknessPct: number | null;
  opticalPct: number | null;
  index: number | null;
  cutQwotPct: number | null;
  /** |error| / σ; null where no σ is reported (held index, missing layer). */
  zThickness: number | null;
  zIndex: number | null;
  zCut: number | null;
}

export function layerErrors(seed: number, result: AnalysisResult, truth: LayerTruth[]): LayerError[] {
  return truth.map((t) => {
    const l = result.layers.find((x) => x.layer === t.layer);
    if (!l) return { seed, layer: t.layer, qwot: t.qwotAtMonitor, thicknessPct: null, opticalPct: null, index: null, cutQwotPct: null, zThickness: null, zIndex: null, zCut: null };
    const z = (err: number, sigma: number) => (sigma > 0 && Number.isFinite(sigma) ? Math.abs(err) / sigma : null);
    const cutErr = l.cutErrorQwotPct - t.cutErrorQwotPct;
    return {
      seed, layer: t.layer, qwot: t.qwotAtMonitor,
      thicknessPct: (l.thicknessNm / t.thicknessNm - 1) * 100,
      opticalPct: ((l.index * l.thicknessNm) / (t.index * t.thicknessNm) - 1) * 100,
      index: l.index - t.index,
      cutQwotPct: cutErr,
      zThickness: z(l.thicknessNm - t.thicknessNm, l.thicknessSigmaNm),
      zIndex: l.indexHeld ? null : z(l.index - t.index, l.indexSigma),
      zCut: z(cutErr, l.cutErrorSigmaQwotPct),
    };
  });
}

export interface Summary {
  layers: number;
  missing: number;
  maxThicknessPct: number;
  rmsThicknessPct: number;
  maxIndex: number;
  rmsIndex: number;
  maxCutQwotPct: number;
  rmsCutQwotPct: number;
  maxThinOpticalPct: number;
  /** Fraction of layers (with a σ) whose truth lies within 3σ. */
  coverage: { thickness: number | null; index: number | null; cut: number | null };
}

const rms = (v: number[]) => (v.length ? Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length) : 0);
const maxAbs = (v: number[]) => v.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
const within3 = (z: (number | null)[]) => {
  const has = z.filter((v): v is number => v !== null);
  return has.length ? has.filter((v) => v <= 3).length / has.length : null;
};

export function summarize(errors: LayerError[]): Summary {
  const found = errors.filter((e) => e.thicknessPct !== null);
  const thick = found.filter((e) => e.qwot >= 0.5);
  const thin = found.filter((e) => e.qwot < 0.5);
  return {
    layers: errors.length, missing: errors.length - found.length,
    maxThicknessPct: maxAbs(thick.map((e) => e.thicknessPct!)), rmsThicknessPct: rms(thick.map((e) => e.thicknessPct!)),
    maxIndex: maxAbs(thick.map((e) => e.index!)), rmsIndex: rms(thick.map((e) => e.index!)),
    maxCutQwotPct: maxAbs(found.map((e) => e.cutQwotPct!)), rmsCutQwotPct: rms(found.map((e) => e.cutQwotPct!)),
    maxThinOpticalPct: maxAbs(thin.map((e) => e.opticalPct!)),
    coverage: { thickness: within3(found.map((e) => e.zThickness)), index: within3(found.map((e) => e.zIndex)), cut: within3(found.map((e) => e.zCut)) },
  };
}

/** What breaks the targets, one line each (empty when all are met). */
export function misses(s: Summary, t: Targets): string[] {
  const out: string[] = [];
  if (s.missing > 0) out.push(`${s.missing} layer(s) without a result`);
  if (s.maxThicknessPct > t.thicknessPct) out.push(`thickness ${s.maxThicknessPct.toFixed(3)} % > ${t.thicknessPct} %`);
  if (s.maxIndex > t.index) out.push(`index ${s.maxIndex.toFixed(4)} > ${t.index}`);
  if (s.maxCutQwotPct > t.cutQwotPct) out.push(`cut error ${s.maxCutQwotPct.toFixed(3)} % QWOT > ${t.cutQwotPct}`);
  if (s.maxThinOpticalPct > t.thinOpticalPct) out.push(`thin-layer optical thickness ${s.maxThinOpticalPct.toFixed(3)} % > ${t.thinOpticalPct} %`);
  if (t.coverage !== null) {
    for (const [k, v] of Object.entries(s.coverage)) if (v !== null && v < t.coverage) out.push(`${k} 3σ coverage ${(v * 100).toFixed(0)} % < ${t.coverage * 100} %`);
  }
  return out;
}

const f = (v: number | null, d = 3, w = 8) => (v === null ? '—' : v.toFixed(d)).padStart(w);
const pct = (v: number | null) => (v === null ? '   —' : `${(v * 100).toFixed(0).padStart(3)}%`);

/** The per-layer table and the summary line of one scenario and mode. */
export function formatTable(title: string, errors: LayerError[], s: Summary): string {
  const head = 'seed layer  QWOT   d err %    n err  cut %QW   |z_d|   |z_n| |z_cut|';
  const rows = errors.map((e) =>
    `${String(e.seed).padStart(4)} ${String(e.layer).padStart(5)} ${f(e.qwot, 2, 5)} ${f(e.thicknessPct)} ${f(e.index, 4)} ${f(e.cutQwotPct)} ${f(e.zThickness, 1, 7)} ${f(e.zIndex, 1, 7)} ${f(e.zCut, 1, 7)}`);
  const sum =
    `max|d| ${s.maxThicknessPct.toFixed(3)} % (RMS ${s.rmsThicknessPct.toFixed(3)})  max|n| ${s.maxIndex.toFixed(4)} (RMS ${s.rmsIndex.toFixed(4)})  ` +
    `max|cut| ${s.maxCutQwotPct.toFixed(3)} %QW (RMS ${s.rmsCutQwotPct.toFixed(3)})  thin max|nd| ${s.maxThinOpticalPct.toFixed(3)} %  ` +
    `3σ coverage d ${pct(s.coverage.thickness)} n ${pct(s.coverage.index)} cut ${pct(s.coverage.cut)}  missing ${s.missing}/${s.layers}`;
  return `${title}\n${head}\n${rows.join('\n')}\n${sum}`;
}
