/** Number formatting for the run pages: fixed decimals, an en dash for a missing value, a true minus sign. */
export function fixed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  return value.toFixed(digits).replace(/^-/, '−');
}

export function signed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  return (value > 0 ? '+' : '') + fixed(value, digits);
}

export function formatDate(d: Date | null): string {
  return d ? d.toISOString().slice(0, 10) : '–';
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${(n / (1024 * 1024)).toFixed(1)} MB`;
}
