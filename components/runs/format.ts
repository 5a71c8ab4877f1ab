/** Number formatting for the run pages: fixed decimals, an en dash for a missing value, a true minus sign. */
export function fixed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  const text = value.toFixed(digits);
  // A value that rounds to zero shows no sign ("0.0000", not "−0.0000").
  return Number(text) === 0 ? text.replace(/^-/, '') : text.replace(/^-/, '−');
}

export function signed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  const text = fixed(value, digits);
  return value > 0 && Number(value.toFixed(digits)) !== 0 ? `+${text}` : text;
}

export function formatDate(d: Date | null): string {
  return d ? d.toISOString().slice(0, 10) : '–';
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${(n / (1024 * 1024)).toFixed(1)} MB`;
}
