import { medianInPlace } from './robustStats';

/** The trace's median logging interval, s, from its first samples (the whole trace where short). */
export function loggedIntervalS(timeS: ArrayLike<number>): number {
  const n = Math.min(timeS.length, 20001);
  if (n < 2) return NaN;
  const steps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) steps[i - 1] = timeS[i] - timeS[i - 1];
  return medianInPlace(steps);
}
