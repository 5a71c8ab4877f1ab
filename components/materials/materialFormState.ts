// The material form's strings and the model they make. Text that is not a number is sent as it
// is, so the server's schema names the field.

type Doc = Record<string, unknown>;

export type ModelKind = 'constant' | 'cauchy' | 'sellmeier' | 'table';

export type MaterialFormState = {
  model: ModelKind;
  n: string;
  k: string;
  A: string;
  B: string;
  C: string;
  sellB: string;
  sellC: string;
  table: string;
  validFromNm: string;
  validToNm: string;
};

const str = (v: unknown) => (v === undefined || v === null ? '' : String(v));

function num(text: string): number | string {
  const t = text.trim();
  return t !== '' && Number.isFinite(Number(t)) ? Number(t) : t;
}

const list = (text: string) => text.split(/[,;\s]+/).filter(Boolean).map(num);

export function formFromModel(model: unknown): MaterialFormState {
  const m = (typeof model === 'object' && model !== null ? model : { model: 'constant', n: 1.5, k: 0 }) as Doc;
  const kind = (['constant', 'cauchy', 'sellmeier', 'table'].includes(String(m.model)) ? m.model : 'constant') as ModelKind;
  return {
    model: kind,
    n: str(m.n),
    k: str(m.k ?? 0),
    A: str(m.A),
    B: kind === 'cauchy' ? str(m.B) : '',
    C: kind === 'cauchy' ? str(m.C ?? 0) : '',
    sellB: kind === 'sellmeier' && Array.isArray(m.B) ? m.B.join(', ') : '',
    sellC: kind === 'sellmeier' && Array.isArray(m.C) ? m.C.join(', ') : '',
    table: kind === 'table' && Array.isArray(m.points) ? (m.points as unknown[][]).map((p) => p.join(' ')).join('\n') : '',
    validFromNm: str(m.validFromNm),
    validToNm: str(m.validToNm),
  };
}

export function modelFromForm(s: MaterialFormState): Doc {
  const range: Doc = {};
  if (s.validFromNm.trim()) range.validFromNm = num(s.validFromNm);
  if (s.validToNm.trim()) range.validToNm = num(s.validToNm);
  switch (s.model) {
    case 'constant':
      return { model: 'constant', n: num(s.n), k: num(s.k || '0'), ...range };
    case 'cauchy':
      return { model: 'cauchy', A: num(s.A), B: num(s.B), C: num(s.C || '0'), k: num(s.k || '0'), ...range };
    case 'sellmeier':
      return { model: 'sellmeier', B: list(s.sellB), C: list(s.sellC), ...range };
    case 'table':
      return {
        model: 'table',
        points: s.table
          .split('\n')
          .map((line) => line.trim())
          .filter(Boolean)
          .map((line) => {
            const cells = list(line);
            return cells.length === 2 ? [...cells, 0] : cells;
          }),
        ...range,
      };
  }
}
