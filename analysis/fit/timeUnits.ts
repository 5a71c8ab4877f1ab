import { median } from '../trace';

/**
 * Deposition rates of optical coating processes lie within about 0.01–10 nm/s: evaporation of
 * oxides and fluorides at 0.1–2 nm/s, ion-assisted and sputtered films at 0.05–1 nm/s, metals a
 * few nm/s (common practice). A run whose layers grew far outside that band was most likely
 * logged with its times in another unit than `time_s` says: milliseconds read 1000× slower,
 * minutes 60× faster. The band is widened a little either way before anything is said.
 */
const SLOWEST_NM_PER_S = 0.003;
const FASTEST_NM_PER_S = 20;

/** A run warning where the layers' median rate lies outside the band above; null otherwise. */
export function timeUnitWarning(ratesNmPerS: readonly number[]): string | null {
  const m = median(ratesNmPerS.filter((x) => Number.isFinite(x) && x > 0));
  if (!(m < SLOWEST_NM_PER_S || m > FASTEST_NM_PER_S)) return null;
  return `the layers grew at a median ${Number(m.toPrecision(2))} nm/s, where coating processes run at about 0.01–10 nm/s: `
    + `is the trace's time_s column in seconds? (times in milliseconds make the layers look 1000× slower, in minutes 60× faster; `
    + 'every rate, and the timing of each cut, is then off by that factor)';
}
