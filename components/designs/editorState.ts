// The design editor's state: the form's strings, kept as typed, and the document they make.
// Numbers are sent as numbers when they read as one and as the text otherwise, so the server's
// parseDesign names the key of anything wrong.

type Doc = Record<string, unknown>;

export type EditorLayer = {
  id: number;
  material: string;
  thickness: string;
  unit: 'nm' | 'qwot';
  wavelengthNm: string;
  mode: 'T' | 'R';
  chip: string;
  cut: 'turning-point' | 'level';
  tolThicknessPct: string;
  tolIndexAbs: string;
  tolCutErrorQwotPct: string;
};

export type EditorState = {
  referenceWavelengthNm: string;
  /** A material name, or FROM_FILE to keep the model the document carries. */
  substrate: string;
  ambient: string;
  backside: boolean;
  tolThicknessPct: string;
  tolIndexAbs: string;
  tolCutErrorQwotPct: string;
  layers: EditorLayer[];
  nextId: number;
  /** The document edited, for the keys the form does not show (materials, notes, …). */
  base: Doc;
};

export const FROM_FILE = '(model in the file)';

const str = (v: unknown): string => (v === undefined || v === null ? '' : String(v));

function ref(value: unknown, fallback: string): string {
  if (value === undefined) return fallback;
  return typeof value === 'string' ? value : FROM_FILE;
}

export function fromDocument(document: unknown): EditorState {
  const doc: Doc = typeof document === 'object' && document !== null ? (document as Doc) : {};
  const tol = (doc.tolerance ?? {}) as Doc;
  const layers = (Array.isArray(doc.layers) ? doc.layers : []).map((raw: unknown, i: number): EditorLayer => {
    const l = (raw ?? {}) as Doc;
    const m = (l.monitor ?? {}) as Doc;
    const t = (l.tolerance ?? {}) as Doc;
    return {
      id: i + 1,
      material: str(l.material),
      thickness: str(l.qwot !== undefined ? l.qwot : l.thicknessNm),
      unit: l.qwot !== undefined ? 'qwot' : 'nm',
      wavelengthNm: str(m.wavelengthNm),
      mode: m.mode === 'R' ? 'R' : 'T',
      chip: str(m.chip ?? 1),
      cut: m.cut === 'level' ? 'level' : 'turning-point',
      tolThicknessPct: str(t.thicknessPct),
      tolIndexAbs: str(t.indexAbs),
      tolCutErrorQwotPct: str(t.cutErrorQwotPct),
    };
  });
  return {
    referenceWavelengthNm: str(doc.referenceWavelengthNm),
    substrate: ref(doc.substrate, ''),
    ambient: ref(doc.ambient, 'vacuum'),
    backside: doc.substrateBackside === true,
    tolThicknessPct: str(tol.thicknessPct),
    tolIndexAbs: str(tol.indexAbs),
    tolCutErrorQwotPct: str(tol.cutErrorQwotPct),
    layers,
    nextId: layers.length + 1,
    base: doc,
  };
}

/** A number when the text reads as one; the text itself otherwise (parseDesign then names the key). */
function num(text: string): number | string {
  const t = text.trim();
  return t !== '' && Number.isFinite(Number(t)) ? Number(t) : t;
}

function tolerance(a: string, b: string, c: string): Doc | undefined {
  const out: Doc = {};
  if (a.trim()) out.thicknessPct = num(a);
  if (b.trim()) out.indexAbs = num(b);
  if (c.trim()) out.cutErrorQwotPct = num(c);
  return Object.keys(out).length ? out : undefined;
}

export function toDocument(s: EditorState): Doc {
  const doc: Doc = { ...s.base, format: 'fringelog.design/1', referenceWavelengthNm: num(s.referenceWavelengthNm), substrateBackside: s.backside };
  if (s.substrate !== FROM_FILE) doc.substrate = s.substrate;
  if (s.ambient !== FROM_FILE) doc.ambient = s.ambient;
  const designTol = tolerance(s.tolThicknessPct, s.tolIndexAbs, s.tolCutErrorQwotPct);
  if (designTol) doc.tolerance = designTol;
  else delete doc.tolerance;
  doc.layers = s.layers.map((l) => {
    const layer: Doc = { material: l.material };
    layer[l.unit === 'qwot' ? 'qwot' : 'thicknessNm'] = num(l.thickness);
    layer.monitor = { wavelengthNm: num(l.wavelengthNm), mode: l.mode, chip: num(l.chip), cut: l.cut };
    const t = tolerance(l.tolThicknessPct, l.tolIndexAbs, l.tolCutErrorQwotPct);
    if (t) layer.tolerance = t;
    return layer;
  });
  return doc;
}

export type EditorAction =
  | { type: 'set'; patch: Partial<Omit<EditorState, 'layers' | 'nextId' | 'base'>> }
  | { type: 'layer'; index: number; patch: Partial<Omit<EditorLayer, 'id'>> }
  | { type: 'add' }
  | { type: 'remove'; index: number }
  | { type: 'duplicate'; index: number }
  | { type: 'move'; index: number; by: -1 | 1 };

/** A new layer copies the monitor settings of the last one (usually the same chip and wavelength). */
function blankLayer(s: EditorState): EditorLayer {
  const last = s.layers[s.layers.length - 1];
  return {
    id: s.nextId,
    material: last?.material ?? '',
    thickness: '1',
    unit: 'qwot',
    wavelengthNm: last?.wavelengthNm ?? s.referenceWavelengthNm,
    mode: last?.mode ?? 'T',
    chip: last?.chip ?? '1',
    cut: last?.cut ?? 'turning-point',
    tolThicknessPct: '',
    tolIndexAbs: '',
    tolCutErrorQwotPct: '',
  };
}

export function editorReducer(s: EditorState, a: EditorAction): EditorState {
  switch (a.type) {
    case 'set':
      return { ...s, ...a.patch };
    case 'layer':
      return { ...s, layers: s.layers.map((l, i) => (i === a.index ? { ...l, ...a.patch } : l)) };
    case 'add':
      return { ...s, layers: [...s.layers, blankLayer(s)], nextId: s.nextId + 1 };
    case 'remove':
      return { ...s, layers: s.layers.filter((_, i) => i !== a.index) };
    case 'duplicate': {
      const copy = { ...s.layers[a.index], id: s.nextId };
      return { ...s, layers: [...s.layers.slice(0, a.index + 1), copy, ...s.layers.slice(a.index + 1)], nextId: s.nextId + 1 };
    }
    case 'move': {
      const to = a.index + a.by;
      if (to < 0 || to >= s.layers.length) return s;
      const layers = [...s.layers];
      [layers[a.index], layers[to]] = [layers[to], layers[a.index]];
      return { ...s, layers };
    }
  }
}
