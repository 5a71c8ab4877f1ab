import { type DesignLayer } from '../design';

/** The trace's own `monitor_wavelength_nm` metadata against the design: a wrong design chosen is the usual cause. */
export function monitorWavelengthMismatch(meta: Record<string, string>, layers: readonly DesignLayer[]): string | null {
  const raw = meta['monitor_wavelength_nm'];
  const stated = raw === undefined ? Number.NaN : Number(raw);
  if (!Number.isFinite(stated) || layers.length === 0) return null;
  const off = layers.filter((l) => Math.abs(l.monitor.wavelengthNm - stated) > 0.5);
  if (off.length === 0) return null;
  const wl = [...new Set(off.map((l) => l.monitor.wavelengthNm))].join(', ');
  return `the trace states monitor_wavelength_nm ${stated}, but the design monitors layer${off.length > 1 ? 's' : ''} ${off.map((l) => l.layer).join(', ')} at ${wl} nm: check that this is the run's design`;
}
