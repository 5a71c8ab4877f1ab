/** The `# key: value` lines at the top of a trace CSV (shared/FORMATS.md), read in the browser before upload. */
export function readTraceHeader(text: string): Record<string, string> {
  const meta: Record<string, string> = {};
  for (const raw of text.replace(/^\uFEFF/, '').split('\n')) {
    const line = raw.replace(/\r$/, '');
    if (line.trim() === '') continue;
    if (!line.startsWith('#')) break;
    const colon = line.indexOf(':');
    if (colon < 0) continue;
    const key = line.slice(1, colon).trim();
    if (key) meta[key] = line.slice(colon + 1).trim();
  }
  return meta;
}

export type UploadForm = { design: string; designRevision: string; chamber: string; runCode: string; shift: string; operator: string; startedAt: string };

/**
 * The form's first values from a trace's metadata: the design only when it names a known one
 * (its newest revision), the date as YYYY-MM-DD when it starts with one.
 */
export function formFromHeader(meta: Record<string, string>, designs: { name: string; revision: number }[], chambers: string[]): UploadForm {
  const design = designs.find((d) => d.name === meta.design);
  const newest = design ? Math.max(...designs.filter((d) => d.name === design.name).map((d) => d.revision)) : undefined;
  const date = /^\d{4}-\d{2}-\d{2}/.exec(meta.date ?? '')?.[0] ?? '';
  return {
    design: design?.name ?? '',
    designRevision: newest ? String(newest) : '',
    chamber: chambers.includes(meta.chamber ?? '') ? meta.chamber : '',
    runCode: meta.run ?? '',
    shift: meta.shift ?? '',
    operator: meta.operator ?? '',
    startedAt: date,
  };
}
