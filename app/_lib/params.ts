/** A search parameter that must appear once: a repeated one (`?token=a&token=b`) counts as absent. */
export function oneParam(value: string | string[] | undefined): string | undefined {
  return typeof value === 'string' ? value : undefined;
}

/** A table's own entry for a key from the request; never an inherited one (`constructor`, `__proto__`). */
export function lookUp<T>(table: Record<string, T>, key: string | undefined): T | undefined {
  return key !== undefined && Object.hasOwn(table, key) ? table[key] : undefined;
}
