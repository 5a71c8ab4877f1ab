import { type ChamberOptions } from './options';
import { type ChamberRng } from './rng';

/**
 * The detector chain from optical response to reading: lamp gain with drift, stray light, the
 * electronic offset, white noise, AR(1) correlated noise (x ← ρx + √(1−ρ²)·σ·g with
 * ρ = e^(−Δt/τ), the exact discretisation of an Ornstein–Uhlenbeck process) and short spikes;
 * optionally a lamp ripple and a detector that reads low toward full scale.
 */
export class Detector {
  private ar = 0;
  private rho = 0;
  private arScale = 0;
  private spikeLeft = 0;
  private spikeValue = 0;
  private readonly spikeP: number;
  private wanderT = 0;
  private wanderHz = NaN;
  private wanderPhase = 0;

  constructor(
    private readonly o: Required<Pick<ChamberOptions, 'gain' | 'lampDriftPerHour' | 'darkOffset' | 'strayFraction' | 'whiteNoise'>> & ChamberOptions,
    private readonly dt: number,
    private readonly noiseRng: ChamberRng,
    private readonly arRng: ChamberRng,
    private readonly spikeRng: ChamberRng,
    /** The ripple frequency's wander (lampRipple.frequencyWander), on its own stream. */
    private readonly wanderRng?: ChamberRng,
  ) {
    const c = o.correlatedNoise;
    if (c && c.fraction > 0) {
      this.rho = Math.exp(-dt / c.correlationS);
      this.arScale = c.fraction * Math.sqrt(1 - this.rho * this.rho);
      this.ar = c.fraction * arRng.gauss();
    }
    this.spikeP = o.spikes ? (o.spikes.perMinute * dt) / 60 : 0;
  }

  /**
   * The ripple's phase beyond 2π·f·t at true time t (option lampRipple.frequencyWander): the
   * frequency's excursion, an Ornstein–Uhlenbeck process stepped exactly between the times asked
   * (which do not go back), integrated at each step's end. 0 without the option.
   */
  private wanderPhaseAt(tS: number): number {
    const w = this.o.lampRipple?.frequencyWander;
    if (!w || !this.wanderRng) return 0;
    // (the excursion at the first reading drawn from the process's stationary spread)
    if (Number.isNaN(this.wanderHz)) this.wanderHz = w.sigmaHz * this.wanderRng.gauss();
    if (tS > this.wanderT) {
      const dt = tS - this.wanderT;
      const a = Math.exp(-dt / w.correlationS);
      this.wanderHz = a * this.wanderHz + w.sigmaHz * Math.sqrt(1 - a * a) * this.wanderRng.gauss();
      this.wanderPhase += 2 * Math.PI * this.wanderHz * dt;
      this.wanderT = tS;
    }
    return this.wanderPhase;
  }

  gainAt(tS: number): number {
    return this.o.gain * this.lampAt(tS);
  }

  /**
   * The lamp's intensity relative to t = 0: its linear drift and, where set, a ripple at the
   * mains-driven frequency that the lock-in leaves (lampRipple), sampled at each reading's true time.
   */
  lampAt(tS: number): number {
    const r = this.o.lampRipple;
    const ripple = r ? 1 + r.fraction * Math.sin(2 * Math.PI * r.frequencyHz * tS + this.wanderPhaseAt(tS)) : 1;
    return (1 + (this.o.lampDriftPerHour * tS) / 3600) * ripple;
  }

  /** What the detector reads with no light from the chip (lamp on: stray light; off: dark only). */
  offsetAt(tS: number, lampOn = true): number {
    return this.o.darkOffset + (lampOn ? this.gainAt(tS) * this.o.strayFraction : 0);
  }

  reading(fraction: number, tS: number, lampOn = true): number {
    let v = this.offsetAt(tS, lampOn) + (lampOn ? this.gainAt(tS) * fraction : 0);
    const fullScale = this.o.gain;
    // a detector chain that reads low toward the top of its range (nonlinearity): v·(1 − β·v/full scale)
    if (this.o.nonlinearity) v *= 1 - (this.o.nonlinearity * v) / fullScale;
    v += fullScale * this.o.whiteNoise * this.noiseRng.gauss();
    if (this.arScale > 0) {
      this.ar = this.rho * this.ar + this.arScale * this.arRng.gauss();
      if (lampOn) v += fullScale * this.ar;
    }
    if (this.spikeP > 0) {
      const s = this.o.spikes!;
      if (this.spikeLeft === 0 && this.spikeRng.next() < this.spikeP) {
        this.spikeLeft = 1 + Math.floor(this.spikeRng.next() * s.maxSamples);
        this.spikeValue = (this.spikeRng.next() < 0.5 ? -1 : 1) * this.spikeRng.between(s.amplitude[0], s.amplitude[1]);
      }
      if (this.spikeLeft > 0) {
        v += fullScale * this.spikeValue;
        this.spikeLeft--;
      }
    }
    return v;
  }
}
