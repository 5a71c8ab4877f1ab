import { type Design, type DesignLayer } from './parseDesign';

export interface LayerDiffRow {
  /** Layer number in each revision (null: not there). */
  a: number | null;
  b: number | null;
  kind: 'same' | 'changed' | 'added' | 'removed';
  /** Names of what differs: material, thicknessNm, monitor.wavelengthNm, … */
  changes: string[];
  before: DesignLayer | null;
  after: DesignLayer | null;
}

/** Thicknesses closer than this (nm) count as equal: a QWOT round trip is not a change. */
const THICKNESS_EPS_NM = 1e-6;

function changesOf(x: DesignLayer, y: DesignLayer, xd: Design, yd: Design): string[] {
  const out: string[] = [];
  if (x.material !== y.material) out.push('material');
  else if (JSON.stringify(xd.materials[x.material]) !== JSON.stringify(yd.materials[y.material])) out.push('material model');
  if (Math.abs(x.thicknessNm - y.thicknessNm) > THICKNESS_EPS_NM) out.push('thickness');
  for (const k of ['wavelengthNm', 'mode', 'chip', 'cut'] as const) if (x.monitor[k] !== y.monitor[k]) out.push(`monitor ${k === 'wavelengthNm' ? 'wavelength' : k}`);
  for (const k of ['thicknessPct', 'indexAbs', 'cutErrorQwotPct'] as const) if (x.tolerance[k] !== y.tolerance[k]) out.push(`tolerance ${k}`);
  return out;
}

/** Layer differences by position (deposition order): the layer table of two revisions side by side. */
export function layerDiff(a: Design, b: Design): LayerDiffRow[] {
  const rows: LayerDiffRow[] = [];
  const count = Math.max(a.layers.length, b.layers.length);
  for (let i = 0; i < count; i++) {
    const x = a.layers[i] ?? null;
    const y = b.layers[i] ?? null;
    if (x && y) {
      const changes = changesOf(x, y, a, b);
      rows.push({ a: x.layer, b: y.layer, kind: changes.length ? 'changed' : 'same', changes, before: x, after: y });
    } else if (x) rows.push({ a: x.layer, b: null, kind: 'removed', changes: [], before: x, after: null });
    else if (y) rows.push({ a: null, b: y.layer, kind: 'added', changes: [], before: null, after: y });
  }
  return rows;
}
