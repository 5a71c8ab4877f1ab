/**
 * The shutter's closing time as the run shows it: each layer whose growth after the cut the
 * data determine gives t = δ / r (the growth over the layer's final rate: half the closing time
 * when the rate falls linearly, whatever the law, the time at full rate that grows as much).
 * A layer whose growth the data cannot tell (a turning-point cut with no layer after it on the
 * chip) takes its growth as r·t̄ with the prediction σ of a new observation, s·√(1 + 1/m)
 * (the prediction interval of a normal sample, e.g. D. C. Montgomery, G. C. Runger, Applied
 * Statistics and Probability for Engineers, §8-7; from memory), so the spread of the closing
 * time from cut to cut, not only the mean's σ, reaches the layer's σ.
 */
export class ShutterTime {
  private readonly times = new Map<number, { timeS: number; sigmaS: number }>();

  /** Records (or replaces) a layer's determined time, s. */
  add(layer: number, timeS: number, sigmaS: number): void {
    this.times.set(layer, { timeS, sigmaS });
  }

  remove(layer: number): void {
    this.times.delete(layer);
  }

  get count(): number {
    return this.times.size;
  }

  /**
   * The time a further layer's shutter takes at the final rate, with the σ of a new
   * observation; null with fewer than 3 layers to go by (their spread is unknown then).
   */
  predict(exceptLayer?: number): { timeS: number; sigmaS: number; from: number } | null {
    const v = [...this.times].filter(([l]) => l !== exceptLayer).map(([, t]) => t);
    const m = v.length;
    if (m < 3) return null;
    const mean = v.reduce((a, t) => a + t.timeS, 0) / m;
    const s2 = v.reduce((a, t) => a + (t.timeS - mean) ** 2, 0) / (m - 1);
    // Never tighter than the layers' own σ (a spread seen only through their noise).
    const own2 = v.reduce((a, t) => a + t.sigmaS ** 2, 0) / m;
    return { timeS: mean, sigmaS: Math.sqrt(Math.max(s2, own2) * (1 + 1 / m)), from: m };
  }
}
