/** A design file that does not follow "fringelog.design/1"; `path` is the key at fault, e.g. "layers[3].monitor.mode". */
export class DesignFormatError extends Error {
  constructor(
    readonly path: string,
    readonly detail: string,
    readonly fileName?: string,
  ) {
    super(`${fileName ?? 'design'}: ${path === '' ? '(top level)' : path}: ${detail}`);
    this.name = 'DesignFormatError';
  }
}

/** ["layers", 3, "monitor"] → "layers[3].monitor". */
export function formatKeyPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}
