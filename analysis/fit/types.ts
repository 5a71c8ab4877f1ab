import { type MaterialDrift } from '../stats';
import { type SpectrumLine, type TraceWarning } from '../trace';
import { type ChipCalibration } from './calibrateChip';
import { type ModelResidualsRequest } from './layerResult';
import { type DetectorLinearity } from './detectorLinearity';
import { type RunLinesRequest } from './runDisturbances';
import { type LayerSpectrum } from './layerSpectrum';
import { type SampleWork, type SampleWorkResult } from './layerSampleWork';
import { type StartDelayProfile } from './startDelay';
import { type StartDelayProfileRequest } from './startDelayRequest';
import { type WanderChoiceRequest } from './wanderChoiceRequest';
import { type WanderPrep } from './wanderPrep';
import { type WanderErrorVariance, type WanderVariancesRequest } from './wanderSigma';

export type AnalysisMode = 'sequential' | 'refit';

export interface AnalyzeOptions {
  /** @default 'sequential' */
  mode?: AnalysisMode;
  /** Most points per layer in the iterations: means of bins equal in time (fit/subsample.ts binMeans); residuals use all samples. @default 400 */
  maxFitPoints?: number;
  /**
   * Bin means per layer in a joint re-fit of the chip after each layer (refit mode); 0 skips
   * these (a quarter less time; the errors of the plain runs stay, but a layer with a rate spike
   * then pulls its neighbours, and reflectance runs lose accuracy). @default 100
   */
  refitPointsPerLayer?: number;
  /** Bin means in all, shared by the chip's layers (each at most maxFitPoints), in the final joint fit. @default 3200 */
  refitFinalPoints?: number;
  /**
   * 'chip': one gain per chip from its bare-chip calibration, held in sequential mode; in refit
   * mode the joint fit refines it (with a linear drift G·(1 + γ·t) if gainDrift). 'per-layer':
   * each layer fits its own gain, which also absorbs part of the error of the stack below as
   * estimated (and of a slow gain drift), at some cost in precision.
   * @default 'per-layer' in sequential mode, 'chip' in refit mode
   */
  gain?: 'per-layer' | 'chip';
  /** Gain mode 'chip', refit: also fit a linear gain drift γ per chip, free (costs precision; for lamp drift). @default false */
  gainDrift?: boolean;
  /**
   * The monitor lamp's (and detector's) stability, fraction of the gain per hour (1σ): the prior
   * of each chip's gain drift γ within the chip, mean 0 or the drift seen across the chips'
   * bare-chip calibrations (fit/gainDriftPrior.ts). γ stays held (at the chips' drift when that is
   * significant, else 0) and the RMS error of the held value under this prior goes into every
   * layer's σ (fit/gainDriftSigma.ts: sequential, each layer's fit again with γ one σ off;
   * refit, the chip's final joint fit again). The estimates do not move; on the chamber
   * simulator the 3σ coverage (d, n, cut) of the real-chamber BBAR refit (one chip, lamp
   * −1 %/h) went 75/67/75 → 100/100/100 %, and no scenario's coverage fell. 0 leaves γ's
   * uncertainty out. Ignored with gainDrift (γ free).
   * @default 0.01 (fit/gainDriftPrior.ts DEFAULT_LAMP_STABILITY_PER_HOUR)
   */
  lampStabilityPerHour?: number;
  /**
   * Refit mode, gain mode 'chip': fit γ under that prior (a MAP estimate in the joint fit) instead
   * of holding it; its σ is then in the joint fit's covariance.
   * Off by default, measured on the chamber simulator: where the lamp drifts within one chip and
   * nothing else mimics it, the drift is recovered (real-chamber BBAR with the shutter-opening
   * ramp off: −0.90 ± 0.32 and −0.83 ± 0.35 %/h for a true −1 %/h; index 0.032 → 0.009,
   * thickness 2.8 → 0.97 %, 3σ coverage 63/50/75 → 100/100/100 %). With the ramp on, the ramp's
   * misfit reads as a further drift of about −0.9 %/h (−0.9 ± 0.3 %/h on the same trace without a
   * lamp drift): real-chamber BBAR index 0.035 → 0.025 but thickness 2.56 → 2.84 %, real-chamber
   * mirror 1.71 → 2.24 %, BBAR without a layer column 1.67 → 4.25 %, 40 layers 1.24 → 1.44 %,
   * R with an offset 0.82 → 0.89 % (targets still met). @default false
   */
  lampDriftFit?: boolean;
  /**
   * Where the trace has a `reference` column (a dual-beam monitor's reading of the lamp itself),
   * divide the signal by it, smoothed and normalised to its run median, and take the lamp drift's
   * prior as what the ratio leaves (fit/lampReference.ts: 0.1 %/h unless lampStabilityPerHour is
   * given). No effect without the column. @default true
   */
  lampReference?: boolean;
  /**
   * A detector chain that reads low toward the top of its range, as the shop measured it: the
   * signal linearised before anything else (fit/detectorLinearity.ts), the model read back through
   * it. Unset or lowPct 0: readings taken as linear.
   */
  detectorLinearity?: DetectorLinearity;
  /**
   * Estimate the detector's gain drift from the bare-chip calibrations of successive chips (two
   * or more) and apply it within every chip, when it exceeds twice its σ. @default true
   */
  gainDriftFromChips?: boolean;
  /**
   * Fit a chip's detector offset (stray light) from its first layers when it has no dark samples
   * (reflectance monitoring; see fit/chipCalibrations.ts); false keeps the offset assumed from
   * other chips or zero. @default true
   */
  fitOffset?: boolean;
  /**
   * With offsetAveraging off: a fitted offset replaces the one assumed (zero, or an earlier chip's) only when it lies more
   * than this many of its σ (statistical and systematic, fit/fittedOffsets.ts) away. At 2 the
   * 12-layer T run with 0.5 % stray light (seeds 55–66) came to 0.72/0.78 % and index 0.0066/0.0067
   * (sequential/refit) from 1.68/1.48 % and 0.030/0.028, two seeds' 0.47 % fits no longer held at
   * zero; but the rate-wander mirror without stray light (seeds 15–24) took spurious offsets, 13/14 →
   * 31/40 of 540 figures beyond 3σ. @default 3
   */
  offsetAdoptionSigma?: number;
  /**
   * A fitted offset averaged with the one assumed (zero, or an earlier chip's), each weighed by an
   * information criterion (Hannan–Quinn's penalty), its σ the models' variances and their spread,
   * carried into the layers in sequential too (fit/offsetAveraging.ts); off, the fitted offset is
   * taken only past offsetAdoptionSigma. 12-layer T run with 0.5 % stray light, seeds 55–66
   * (sequential/refit): 1.66/1.44 → 0.72/0.55 %, index 0.029/0.027 → 0.0046/0.0039, figures
   * beyond 3σ 26/21 → 0/0 of 432; rate-wander mirror without stray light, seeds 15–30: 1.94/1.42 →
   * 1.89/1.35 %, index 0.046/0.034 → 0.045/0.031, 13/4 → 6/2 of 864 beyond 3σ, but RMS
   * 0.641/0.425 → 0.655/0.422 %, index RMS 0.0054/0.0044 → 0.0061/0.0045 (partial offsets where
   * a wandering rate fits one of 0.2–0.45 %). @default true
   */
  offsetAveraging?: boolean;
  /**
   * σ of the detector offset (stray light) of a chip with no dark reading whose first layers do not
   * determine it either (the offset fit's σ beyond 0.2 % of full scale, fit/fittedOffsets.ts), as
   * a fraction of full scale: the offset stays at the one assumed (0), and this σ is carried into
   * every layer's σ (fit/offsetSigma.ts; in sequential through the chip, the gain moving with the
   * offset as the bare reading ties them). A choice, not a published figure: stray light of a few
   * tenths of a % of full scale that the analysis cannot see (common practice); the chamber
   * simulator's real chamber carries 0.3 %, so the default matches the case it was measured on. A
   * shop that has measured its monitor's stray light should set its own; 0 carries none (as
   * before: an undetermined offset was taken as exact). Estimates unchanged. Measured on the
   * chamber simulator: real-chamber BBAR with a lamp reference (one chip, four level cuts, the
   * offset fit's σ about 2 % of full scale), refit seeds 21–36: index 3σ coverage 85 → 98 %,
   * RMS z_n 2.2 → 1.3 (layer 3, 1.95 QWOT: σ_n 0.0011 → 0.0022 against the stray light's
   * −0.0019); sequential σ within 3 %; other scenarios' estimates and coverage unchanged.
   * @default 0.003
   */
  unmeasuredOffsetSigma?: number;
  /**
   * Gain mode 'per-layer': a Gaussian prior holding each layer's gain near the chip calibration
   * (with any known drift), σ as a fraction of the gain; 0 leaves the gains free. @default 0.005
   */
  gainPriorFraction?: number;
  /**
   * Reflectance monitoring without a dark reading: where a chip's fitted offset's profile told its
   * gain from all its layers better than gainPriorFraction, every layer of the chip holds that
   * gain (sequential and refit), its σ carried into the layers (fit/levelCutGain.ts holdsChipGain,
   * fit/heldGainSigma.ts). @default true
   */
  reflectanceChipGain?: boolean;
  /**
   * Gain mode 'per-layer': a layer cut on level takes the chip's calibrated gain (held, with the
   * held drift, its σ carried as in gain mode 'chip') where the bare chip tells the gain five
   * times better than gainPriorFraction (fit/levelCutGain.ts); 'free' gives it a gain of its own
   * as any other layer. @default 'calibration'
   */
  levelCutGain?: 'calibration' | 'free';
  /**
   * Layers below this many quarter-waves at the monitor wavelength get a free trial fit, and
   * their index is held when that fit cannot separate it from the thickness (heldIndexCorrelation,
   * heldIndexSigma). @default 0.9
   */
  thinLayerQwot?: number;
  /** A thin layer's index is held when its trial fit's index–thickness |correlation| exceeds this. @default 0.99 */
  heldIndexCorrelation?: number;
  /**
   * Level-cut layers of any thickness get the thin layers' free trial fit, and their index is held
   * on the same rules (heldIndexCorrelation, heldIndexSigma, the run's other layers of the material). @default true
   */
  heldIndexLevelCut?: boolean;
  /**
   * Huber's loss in every fit, so spikes and outliers count less (fit/solver/huber.ts). Off by
   * default: the fits work on bin means, which dilute short spikes, and on the chamber simulator's
   * spiky traces Huber changed the errors by < 0.03 % while its 5 % efficiency loss cost the
   * white-noise mirror 0.04 % in thickness. @default false
   */
  robustLoss?: boolean;
  /**
   * Let a layer's rate wander within it (knots under an Ornstein–Uhlenbeck prior, fit/rateWander.ts)
   * where the restricted likelihood prefers that to the plain d = r·τ + a·τ²/2 (fit/wanderChoice.ts),
   * both carrying the stack below's errors at their σ (sequential; fit/wanderStackBelow.ts), the
   * growth read from the layer's start and a chip-wide held gain. Off by default, measured on the
   * chamber simulator with startTransient on: it helps where the rate wanders (rate-wander
   * mirror, refit 1.65 → 1.21 %, sequential 1.81 → 1.69 %; real-chamber mirror, sequential
   * 2.03 → 1.21 %, refit 1.78 → 0.82 %), equals elsewhere within 0.03 %, and still hurts 40 layers
   * on 5 chips (sequential 1.33 → 1.84 %, coverage 98 → 90 %; refit 0.97 → 1.28 %). In refit a
   * layer whose own choice keeps no wander takes its material's shared one (fit/pooledWander.ts),
   * its knots free in the final joint fit: over 20 seeds, rate-wander mirror max 1.36 → 1.40 %,
   * RMS 0.39 → 0.36 %, 3σ coverage 97.2 → 99.2 %, RMS z 1.25 → 1.03; real-chamber mirror 1.85 → 1.34 %,
   * 0.445 → 0.383 %, 96.1 → 98.3 %, 1.41 → 1.18 (default: 1.75 %, 0.455 %, 99.4 %, 0.95). Not the
   * default: the bench's 40-layer refit takes 2.6 s of CPU without it, 4.5 s with it. @default false
   */
  rateWander?: boolean;
  /**
   * With rateWander off: where the restricted likelihood finds the layer's rate wandering
   * (fit/wanderChoice.ts), the point estimates stay the plain law's and the wander's cost to them
   * is carried into σ (fit/wanderSigma.ts). Measured on the chamber simulator: 3σ coverage of
   * thickness/cut, rate-wander mirror sequential 86/89 → 94/94 %, refit 94/94 → 100/100 %;
   * real-chamber mirror sequential 94/94 → 100/100 %, refit 89/89 → 100/100 %; every estimate
   * and every other scenario's figures unchanged. In sequential, a layer whose own choice keeps
   * no wander takes its material's, from the layers' choices together (fit/pooledWander.ts):
   * rate-wander mirror 94/94 → 100/100 %, 40 layers 93/98 → 100/100 %, estimates unchanged.
   * @default true
   */
  wanderSigma?: boolean;
  /**
   * Fit a linear index gradient through a layer (Δn from its bottom to its top; the index is then
   * the layer's mean), computed as homogeneous sublayers (optics/gradedLayer.ts): every layer of
   * at least 1.5 QWOT at its monitor wavelength with a free index gets a trial fit with Δn free
   * (a quarter-wave hardly tells Δn: fit/indexGradient.ts GRADIENT_MIN_QWOT),
   * kept where Δn is beyond 3σ (fit/indexGradient.ts); the others stay uniform. Each trial's Δn
   * and σ are reported in the layer's result (indexGradient, indexGradientSigma, indexGradientKept).
   * Off by default, measured on the chamber simulator: on two half-wave layers graded +0.02 (H) and
   * −0.01 (L) under the real chamber's noise (refit, 5 seeds) Δn comes back within 3σ where kept
   * (the H layer in 4 of 5 seeds); where kept, the H layer's errors fall from 0.0008–0.0011 to
   * ≤ 0.0003 in index and from 0.08–0.11 % to ≤ 0.04 % in thickness (sequential: index 0.002–0.0037
   * to ≤ 0.0018); the L layer on top, last on the chip, moves either way (0.21 → 0.08 %, 0.11 →
   * 0.32 %); a uniform film keeps none in refit, but in sequential mode one seed of five kept
   * −0.007 ± 0.002 and −0.008 ± 0.0015 (σ too small there), and a kept last layer on the chip
   * came out up to 0.3 % thicker. In the accuracy scenarios only the real-chamber BBAR changes
   * (its 1.95-QWOT layer 3 is the only layer of ≥ 1.5 QWOT with a graded index; the mirrors' layers
   * are quarter-waves and get no trial): refit 2.56 → 1.89 % in thickness but index coverage
   * 67 → 50 %, sequential 2.96 → 2.85 % with the index 0.036 → 0.045: the gradient kept there
   * (0.026 ± 0.003 against a true 0.003) takes up the lamp drifting within the chip, which also
   * moves a half-wave's turning point off the level below (without the lamp drift it is not kept).
   * @default false
   */
  indexGradient?: boolean;
  /**
   * Read the growth after a turning-point cut from where the next layer on the chip starts on its
   * fringe (fit/growthFromNext.ts, re-read after each chip's joint fit, fit/jointGrowth.ts). With
   * it off a turning-point cut's growth is not told by anything in the run, and its possible size
   * (a shutter of up to 2 s) goes into σ: on a trace without a shutter delay σ_d grows from about
   * 0.15 % to 0.5 %. It takes up some misfit of the stack below (a stray offset, correlated noise)
   * as growth. @default true
   */
  growthFromNext?: boolean;
  /**
   * Refit mode: the growth after a level cut read again with the chip's final joint fit from
   * where the next layer starts on the stack it left (fit/jointGrowth.ts, as after a turning-point
   * cut), that reading joined to the idle level's and the run's shutter time (fit/layerEnds.ts),
   * and the layers above moved with it by Gaussian conditioning; only where the next layer is a
   * turning-point cut, whose rate's start-up at the shutter the start transient models, and
   * neither has a held index. Where a next layer cut on level starts, its unmodelled start-up
   * reads as growth (real-chamber BBAR, refit, seeds 21–36, with level-to-level readings: 3σ
   * coverage of d 100 → 96.9 %, cut max 2.42 → 3.05 % QWOT). Where the chip's step with every
   * growth fails its safeguard, these level cuts are read alone. Measured on 'R monitoring with an
   * offset' (layer 4, a level cut under a turning-point cut; the simulator's shutter closes at
   * once), refit: seeds 51–66 max 0.539 → 0.448 %, RMS 0.174 → 0.167 %, index 0.0089 → 0.0076,
   * the layer above's index RMS 0.0034 → 0.0028 (mean +0.0027 → +0.0013); seeds 67–82 0.822 →
   * 0.825 %, RMS 0.268 → 0.242 %, index 0.0092 → 0.0086 (the layer above's RMS 0.0043 → 0.0035),
   * coverage unchanged (100/100/100 %, 100/99.2/100 %); with the simulator's shutter closing in
   * 0.1–1 s, seeds 51–66, 0.482 → 0.481 %, index 0.0102 → 0.0103, cut 0.39 → 0.34 % QWOT, index
   * coverage 97.7 → 98.4 %; with the ramp at opening, shutter 0.1–1 s, rate wander and scatter of
   * the real-chamber scenarios added, seeds 51–66, 1.76 → 1.69 %, RMS 0.642 → 0.626 %, index
   * 0.0346 → 0.0348, cut 1.65 → 1.22 % QWOT, coverage unchanged; the level cuts of the BBAR, thin-R and real-chamber BBAR scenarios
   * stand under level cuts and are not read so (unchanged). What is left on layer 5 of that run
   * is mostly the start delay kept there by Schwarz's criterion where the simulator has none
   * (seeds 52, 56, 65, 68, 71, 73, 74, 77, 79): with option startTransient off the joint fit's
   * reading of layer 4's growth has mean z +0.12 and RMS z 1.09 over seeds 51–82, with it on +0.88
   * and 1.48 (the start-up and a growth both bend the next layer's start). @default true
   */
  levelGrowthFromNext?: boolean;
  /**
   * The run's shutter times (the growth after each cut, fit/shutterTime.ts): 'normal', an uncut
   * normal population (DerSimonian–Laird); 'truncated', a normal population cut at 0 at its
   * maximum likelihood; 'mixture', that population over its own (μ, τ) posterior, each component
   * cut at 0 on its own (fit/truncatedNormal.ts). Measured, 'normal' → 'mixture' (max thickness
   * error, sequential/refit, the accuracy harness's seeds, the overshoot's population as
   * default): gains, 40 layers 1.08/0.77 → 0.95/0.72 %, real-chamber mirror sequential 1.53 →
   * 1.19 %, white-noise mirror 0.21/0.094 → 0.17/0.090 %, R with an offset 0.86/0.42 →
   * 0.85/0.37 %; losses, spikes mirror refit 0.57 → 0.75 %, T with stray light refit 0.41 →
   * 0.53 %, 1 s shutter delay refit 0.08 → 0.15 %, rate-wander mirror refit 1.33 → 1.55 %. Before
   * option overshootPopulation this option chose the overshoot's population too.
   * @default 'normal'
   */
  shutterTimePopulation?: 'normal' | 'truncated' | 'mixture';
  /**
   * With a layer column, a chip's last turning-point cut (option cutPastTurningPoint): its
   * overshoot's prior from the run's other turning-point cuts, each end read relative to its
   * fitted turning point and pinned by the layer above (fit/cutPastTurningPoint.ts):
   * 'uniform', none, the uniform prior on [0, turningPointOvershootPct] alone; 'truncated', a
   * normal population cut at 0 at its maximum likelihood (fit/shutterTime.ts
   * truncatedPopulation); 'mixture', that population over its own (μ, τ) posterior, each
   * component cut at 0 on its own (populationMixture). Where the controller cuts on the turning
   * point itself the uniform prior put each chip's last layer about half the interval thick;
   * the run's other cuts say so. Measured on the chamber simulator, uniform → mixture (max
   * thickness error, sequential/refit; harness seeds, then seeds 101–112): spikes mirror (no
   * overshoot) 0.73/0.57 → 0.46/0.48 %, 1.04/0.66 → 0.70/0.52 %; T with stray light 0.68/0.41 →
   * 0.57/0.26 %; 1 s shutter delay 0.070 → 0.054 % sequential; R with an offset, cut error
   * sequential 0.77 → 0.64 % QWOT; the rate-wander, real-chamber and 40-layer mirrors (overshoot
   * 0.4 ± 0.3 %) unchanged in max; variable shutter delay 0.111/0.066 → 0.117/0.069 %.
   * @default 'mixture'
   */
  overshootPopulation?: 'uniform' | 'truncated' | 'mixture';
  /**
   * Sequential mode: once the pass is over, each layer whose stack below moved since its fit
   * (the growths after the cuts below read again once the run's shutter time was known, which
   * takes three layers' readings) fitted again on its own samples on the stack as it now stands,
   * in order on each chip; its σ kept. Measured on the white-noise mirror (no growth after the
   * cuts), seeds 11–26: chip 1's layers 2, 4, 5, 6 mean error −0.098, −0.107, +0.075, −0.059 →
   * −0.034, −0.008, +0.016, +0.010 %, RMS 0.096 → 0.086 %. @default true
   */
  fitOnFinalStack?: boolean;
  /**
   * Sequential mode: once the pass is over, each layer cut on level fitted again jointly with the
   * next two on its chip, bottom up, on the stack below as it then stands, the rate drifts its
   * layers' data do not carry held at 0; a held thin layer cut on level first takes its index
   * from the whole run (as refit holds it), and once the windows are done again from the layers
   * as they left them, its own window fitted again (fitHeldAgain: thin level cuts in R, seeds
   * 71–86, the chip's first layer n·d max 2.93 → 0.78 %); in reflectance a window's layers share
   * one gain under the pass's prior (sharesGain: there each layer's own gain traded against the
   * thin stack below; thin level cuts in R, seeds 71–86, max 3.32 → 3.05 %, RMS 1.35 → 0.92 %, cut
   * 2.71 → 1.85 % QWOT; in transmittance the AR without a layer column lost 0.93 → 1.57 %, so not
   * there); σ kept (fit/fitWithNextLayer.ts; turning-point cuts
   * keep their own fits, fitted again on the final stack under fitOnFinalStack). A level cut's own
   * samples leave its index and thickness on one curve (and tell a thickness just past a turning
   * point little); the layers that grow on it pin the rest. White-noise BBAR, seeds 11–26: max
   * 0.749 → 0.266 %, cut 0.834 → 0.326 % QWOT, thin layers (n·d) 2.08 → 0.82 %; the same without
   * a layer column, seeds 33–44, 3.93 → 0.93 %; thin level cuts in R, seeds 71–82, 14.8 → 3.1 %;
   * R with an offset, seeds 51–62, 1.02 → 0.98 %. The next layers' start also carries the rate's
   * ramp as the shutter opens (unmodelled on level cuts in the pass), which a window on real time
   * reads as the stack below (real-chamber BBAR, ramp and lamp drift, seeds 21–36: 2.48 → 3.85 %);
   * a window that shows it is read on a start delay's clock, the chip's later windows on the same
   * delay, with the lamp's drift under its prior where the window's layers hold the chip's gain
   * (there 2.08 %, RMS 0.73 %; before, such a chip was left as the pass had it: 2.48 %, RMS 1.07 %,
   * and a thin first layer held at a nominal index the run is off stayed there: the demo's
   * four-layer AR with its lamp drift and ramp, seeds 587–602, layers 1–2 RMS 2.90 and 3.22 → 1.09
   * and 1.68 %, layer 3's false "residuals" warnings 3 → 0). @default true
   */
  fitWithNextLayer?: boolean;
  /**
   * Sequential mode: each level cut's data in reflectance read for the stack below as well (fit/stackPosterior.ts):
   * the chip's layers below, held in the layer's fit at their estimates, taken as a Gaussian prior
   * at the covariance the pass carries (fit/stackUncertainty.ts), the layer's parameters profiled
   * out, with the chip's gain drift, held gain and offset as further directions at their σ;
   * Gauss–Newton steps to the posterior, the layer fitted again on it after each; the layers
   * below moved there (their reported σ kept), the posterior carried on. In reflectance a thin
   * stack below moves a near-extremum level cut by several times its own error, and the layer's
   * data tell that stack better than the layers' own: 'thin level-cut layers (R)', seeds 71–86,
   * max 14.8 → 3.6 %, RMS 3.5 → 1.3 %, thin layers' n·d 14.4 → 2.7 %, coverage 100 % (since the
   * chip's offset fit carries its thin layers' held indices, fit/fittedOffsets.ts, which leaves that
   * offset undetermined, 0 ± 0.31 % of full scale: max 4.1 %, layer 3 RMS 0.82 → 1.84 %; layer 3,
   * 1.2 QWOT: −14.8…+7.4 → −1.3…+1.9 %; layer 4 −9.8…+13.8 → −2.5…+3.0 %; but layer 5, 0.8 QWOT,
   * −2.1…+2.9 → −3.3…+3.6 %); the same with the lamp drifting 1 %/h (14.9 → 3.7 %) or stray
   * light and a dark offset (14.8 → 3.5 %); R with an offset, seeds 51–66 (its one level cut):
   * max 1.02 → 1.04 %, RMS 0.289 → 0.287 %, index 0.0115 → 0.0121. Level cuts in reflectance
   * only (every layer read so took what the model lacks for the stack: real-chamber BBAR in T,
   * seeds 21–36, RMS 1.07 → 1.94 %; R with an offset 1.02 → 2.20 %). Off by default: the thin
   * design with every chamber effect of the real-chamber scenarios, seeds 71–86, max 15.0 →
   * 9.3 %, RMS 6.3 → 3.9 %, but 3σ coverage d/n 95/88 → 91/73 %. Measured with each level cut
   * fitted alone: option fitWithNextLayer (on by default since) pins the same stack by the next
   * layers (thin R seeds 71–82, 14.8 → 3.1 % by itself), and the two together put layer 3 of seeds
   * 71–78 at up to 2.65 %. @default false
   */
  stackFromLayer?: boolean;
  /**
   * The growth after a turning-point cut that nothing but the run's shutter time tells (the last
   * layer on its chip, fit/layerEnds.ts). With option shutterTimePopulation 'truncated' or
   * 'mixture' (the run's times as a population cut at 0) both give that population's mean cut at
   * 0; with 'normal' (the default), as measured here: 'bounded', the posterior mean under that time's
   * prediction cut to [0, the longest shutter], which adds about 0.8σ of the prediction where the
   * shutter closes at once; 'run-mean', the prediction itself (the run's mean time, from readings
   * left unbounded, × the layer's final rate) with its σ, negative where the readings put the
   * run's time below 0; applied once the pass is over (the pass keeps the bounded mean, from which
   * the next layer reads the growth). Measured on the chamber simulator, refit, the chips' last
   * layers (mean error, RMS; bounded → run-mean; the other layers unchanged): no shutter growth,
   * correlated noise and spikes, seeds 15–62, +0.14 → 0.00 %, 0.367 → 0.341 % (max 1.10 → 0.90 %);
   * real-chamber mirror (shutter 0.1–1 s), seeds 21–36, +0.17 → +0.07 %, 0.58 → 0.50 %; T with
   * stray light 0.58 → 0.47 %; R with an offset 0.57 → 0.45 %; white-noise mirror 0.105 → 0.105 %;
   * 40 layers, seeds 41–48, 0.675 → 0.677 % (max 1.91 → 1.70 %); worse on the rate-wander mirror,
   * seeds 15–30, +0.02 → −0.24 %, 0.61 → 0.68 %, where the run's time reads −1 to +1.2 s with σ
   * 0.3–2.3 s and the bound hid that. In sequential mode those layers read low with run-mean
   * (mean −0.06 % white-noise mirror, −0.11 % spikes, −0.35 % rate wander, −0.09 % real chamber;
   * with option fitOnFinalStack white −0.03 %, spikes −0.05 %, rate wander −0.40 %, real chamber
   * +0.02 % against bounded +0.03, +0.09, −0.07, +0.14 %, seeds 11–26, 15–30, 15–30, 21–36; RMS
   * of all layers 0.089/0.086, 0.232/0.234, 0.671/0.641, 0.634/0.631 %), which the bounded mean offsets: RMS
   * 0.137 → 0.157 %, 0.431 → 0.445 %, 0.89 → 0.95 %, 0.68 → 0.74 % (seeds 11–26, 15–30, 15–22,
   * 21–28).
   * @default 'run-mean' in refit mode, 'bounded' in sequential mode
   */
  shutterTimeGrowth?: 'bounded' | 'run-mean';
  /**
   * Without a layer column: the most a turning-point cut may have run past the turning point
   * before the shutter closed, % of the layer (the controller's overshoot). The trace does not
   * show it, so each turning-point cut carries it as a uniform prior on [0, this], with the
   * growth while the shutter closes and the layer below's excess, which moves the layer's turning
   * point back (fit/turningPointExcess.ts; how, option turningPointExcessMean). Measured on the
   * chamber simulator (overshoot 0.4 ± 0.3 %): 3σ coverage of thickness and cut 67–92 % → 100 %
   * in the no-layer-column scenarios. A shop that knows its controller sets it here (0 for one
   * that does not overshoot). @default 1 (common practice)
   */
  turningPointOvershootPct?: number;
  /**
   * Without a layer column: stand each turning-point cut's thickness at the excesses' prior mean
   * past its fitted turning point (E[v] − c·E[u], v its own, u the layer below's, c the
   * self-compensation), σ their variance about it; off, the estimate stays on the turning point
   * and σ takes their mean square about it. Measured on the chamber simulator's no-layer-column
   * runs (overshoot 0.4 ± 0.3 %, seeds 35–36 and 101–106 of the 12-layer run; 31, 37–39, 101–104
   * of the 9-layer): mean error −0.24/−0.26 % → +0.08/+0.06 % (sequential/refit), RMS 0.48/0.53 %
   * → 0.41/0.45 %, max 1.41/1.27 % → 1.17/1.06 %; 9-layer RMS 0.40/0.39 → 0.37/0.35 %; 3σ coverage
   * unchanged (96/96, 95/96 cut refit). Where the controller does not overshoot its cost: RMS
   * 0.19/0.28 → 0.37/0.41 % (12 layers), 0.13 → 0.34 % (9), 0.21 → 0.77 % (one layer, max 1.13 %), no miss of 3σ; with
   * turningPointOvershootPct 0 there, 0.19/0.28 %. @default true
   */
  turningPointExcessMean?: boolean;
  /**
   * With a layer column: a chip's last layer cut at a turning point (nothing above pins its end)
   * stands at or past its fitted turning point d_TP at the last logged sample, by no more than
   * turningPointOvershootPct of the layer (a controller that cuts after it sees the turning point):
   * its fitted thickness there (Gaussian, its σ) under that uniform prior (or the run's overshoot
   * population, option overshootPopulation), the posterior mean (fit/cutPastTurningPoint.ts),
   * unless the reading lies more than 2σ outside that interval; σ narrowed by what the prior told
   * of the end relative to the turning point (endSigmaAfterPrior; unchanged before option
   * overshootPopulation), the growth after the cut added as before. Measured on the chamber simulator (whose
   * controller cuts that way), the chips' last layers (mean, RMS, max; off → on; the other layers
   * unchanged). Refit: rate-wander mirror (overshoot 0.4 ± 0.3 %), seeds 15–30, −0.25 → −0.12 %,
   * 0.59 → 0.45 %, 1.35 → 1.50 %; real-chamber mirror 21–36 +0.06 → +0.06 %, 0.50 → 0.43 %, 1.27 →
   * 1.02 %; 40 layers 41–46 −0.07 → 0.00 %, 0.67 → 0.42 %, 1.66 → 1.21 %; spikes mirror (no
   * overshoot) 15–30 −0.04 → +0.19 %, 0.31 → 0.26 %, 0.69 → 0.61 %; white-noise mirror 11–26
   * −0.02 → +0.05 %, 0.089 → 0.081 %; R with an offset 51–66 RMS 0.35 → 0.25 %; T with stray light
   * 55–66 0.28 → 0.21 %; all within 3σ. Sequential, mixed: rate wander −0.07 → +0.04 %, 0.67 →
   * 0.60 %; real chamber 0.68 → 0.56 %; 40 layers 0.92 → 0.84 %; but spikes +0.09 → +0.34 %, 0.36
   * → 0.41 %, white +0.03 → +0.13 %, 0.11 → 0.14 % (on top of its bounded growth's +0.1 %; with
   * shutterTimeGrowth 'run-mean' the rate wander loses instead, 0.67 → 0.73 %). Measured again
   * (last layers, seeds as above): refit white 0.084 → 0.076 %, spikes 0.31 → 0.26 %, T stray light
   * 55–66 0.29 → 0.22 % (max of all layers 0.51 → 0.41 %: every target met); sequential (true) rate
   * wander 0.61 → 0.56 %, T stray 0.33 → 0.26 %, but spikes 0.36 → 0.41 % (mean +0.34 %), white
   * 0.11 → 0.14 %, 1 s shutter delay 0.05 → 0.07 %, and analysis/synth's R mirror with a 0.5 %
   * offset fitted (seeds 41–52) 0.16 → 0.38 %, mean +0.31 %: its σ when read here is 3.8 % of the
   * layer, so the posterior is the interval's middle. Hence 'refit' (the joint re-fit only) by
   * default then, true in both modes, false never. It was off while analysis/synth cut turning-point
   * layers at the design's thickness ±0.4 % (up to 1.2 % before the turning point): refit
   * 18-layer mirror, seeds 11–13 and 21–24, the last layers −0.21…+0.08 % → up to +1.83 % at 9σ
   * without the 2σ gate, and with it still +0.29–0.41 % on four of the 21. Nor does it remove the sequential
   * rate-wander mirror's low cut (−0.54 % at the last logged sample): the fit reads the cut +0.34 %
   * past its own turning point (the true overshoot's mean 0.4 %), but that turning point lies 0.5 %
   * short of the true one (the layer's index read +0.2 % high, the stack below the rest): the end
   * relative to the turning point is all the option reads. In sequential it now reads that relative
   * reading: x = d_end − d_TP on the layer's own fit's covariance of d and n (the stack below's,
   * the offset's and the gain's shares move both and leave x), its posterior moving the end by
   * β·(E[x] − x̂), β the regression of the end's error on x̂'s within [0, 1]; the 2σ gate on the
   * whole σ (fit/cutPastTurningPoint.ts relativeCut). Sequential, the chips' last layers' RMS (mean),
   * off → on: rate wander 15–30 0.612 → 0.554 % (max of all layers 1.88 → 1.66 %), T stray light
   * 55–66 0.333 → 0.274 %, real chamber 21–36 0.683 → 0.556 % (max 2.03 → 1.12 %), 40 layers 41–48
   * 0.897 → 0.781 %; the simulator without overshoot: spikes 15–30 0.363 → 0.373 % (+0.09 →
   * +0.29 %), white 11–26 0.106 → 0.121 % (+0.03 → +0.10 %), 1 s shutter delay 61–68 0.051 →
   * 0.056 %; analysis/synth's R mirror with a 0.5 % offset, seeds 41–52, its σ 3.8 % of the layer
   * when read here, 36 layers, 0.164 → 0.171 % (+0.07 → +0.09 %; on the whole σ 0.377 %, +0.31 %);
   * R offset 51–66 0.585 → 0.551 % (max of all layers 1.06 → 1.11 %).
   * On the whole σ (the earlier reading) rate wander 0.559 %, spikes 0.407 %, white 0.142 %; β
   * unbounded (read 1.2–1.3) spikes 0.402 %, white 0.134 %. Refit kept the whole σ at first (the
   * joint fit's d carries the stack below's free parameters, which move d_TP too; relative σ there:
   * spikes and real-chamber mirror the same RMS, max of the last layers 1.06 → 1.09 %) until the
   * run's overshoot population (option overshootPopulation) leaned on each reading's σ: on the
   * whole σ, twice the errors' spread on analysis/synth's 18-layer mirror, the population took
   * the last layers over (seeds 11–30 RMS 0.087 → 0.142 %, 0.089 % on the relative σ); refit reads
   * the relative σ too since (analyzeRun.ts relativeReading; harness seeds, refit: rate-wander
   * mirror 1.33 → 0.70 %, its last cuts' σ within the overshoot now). Hence true.
   * @default true
   */
  cutPastTurningPoint?: boolean | 'refit';
  /**
   * Read each material's indices together: a turning-point cut's index (≥ 0.5 QWOT, free) from its
   * material's trend across the run and its own reading, the layers' spread about the trend
   * estimated from them (random-effects model, fit/pooledIndex.ts); n·d stays. Needs five such
   * layers of the material. Measured on the chamber simulator, 12 seeds each: index max
   * (sequential/refit) 40 layers 0.0131/0.0104 → 0.0066/0.0059, real-chamber mirror
   * 0.0110/0.0073 → 0.0063/0.0049, correlated-noise mirror 0.0047/0.0029 → 0.0021/0.0013;
   * thickness max 40 layers 3.09/2.07 → 2.70/1.87 %, elsewhere down or within +0.02 %; cut errors
   * unchanged; index 3σ coverage never lower (T with stray light 85/88 → 89/92 %). @default true
   */
  pooledIndex?: boolean;
  /**
   * Refit mode: in each chip's final joint fit, hold a layer's rate drift a (d = r·τ + a·τ²/2) at
   * 0 where its own data do not carry it (Schwarz's criterion), the chip's drifts scatter no more
   * than their σ say (Cochran's Q) and the chip's residuals are white; the free fit's σ are kept
   * (fit/rateDriftChoice.ts). Measured on the chamber simulator (refit): white-noise BBAR
   * 0.37 → 0.15 % (layer 4, cut on level just past its turning point: 0.37 → 0.15 % and
   * 0.17 → 0.07 %), white-noise mirror 0.235 → 0.222 % (RMS 0.088 → 0.066 %), variable shutter
   * delay 0.136 → 0.079 %; every scenario with correlated noise unchanged. Without the white-residual
   * condition it also helped there (single layer 1.59 → 0.90 %, T with stray light 0.67 → 0.49 %,
   * thin level cuts in R 1.37 → 1.09 %) but on the sample four-layer AR (rate wandering 1 %)
   * layer 4 went 0.27 → 0.65 % off and its cut error past 0.7 % QWOT. @default true
   */
  holdUncarriedDrift?: boolean;
  /**
   * Model the rate's start-up as the shutter opens (fit/startTransient.ts: a linear onset whose
   * effective start delay δ is shared by the run), where the trace has a layer column, in the
   * layers cut on a turning point (a level cut's end is read on the slope; on the sample
   * four-layer AR, level cuts with a 1.2 s ramp, the delay moved layer 2's n·d from 0.42 to
   * 1.13 % off in refit). A layer-by-layer pass profiles each such layer (≥ 0.5 QWOT, index
   * fitted) on 7 delays from 0 to 3 s, each on 50 bin means
   * (fit/startDelay.ts); δ is kept where the pooled χ² beats no delay by Schwarz's margin, its σ
   * no smaller than the delete-one-layer jackknife's (on the chamber simulator with a 1.5 s ramp,
   * RMS (δ̂ − 1.5 s)/σ 0.98 over 16 runs, none beyond 3σ), and the run is then analysed with δ
   * held, each fit refitted from its estimates with δ one σ longer for δ's share of its σ
   * (fit/startDelaySigma.ts). The delay found is reported in the warnings. Measured on the
   * chamber simulator's accuracy scenarios: where the rate ramps up (1.5 s) it helps (40 layers,
   * sequential thickness 3.30 → 1.25 %, refit 1.24 → 0.97 % with coverage 88/90/95 →
   * 100/100/100 %; real-chamber mirror sequential 2.18 → 2.03 %, refit coverage 69/81/81 →
   * 100/100/100 %) with two small losses (real-chamber mirror refit max 1.71 → 1.75 %; 40 layers
   * refit index 0.0061 → 0.0089); traces without a ramp keep no delay, designs cut on level
   * profile none, and their figures stay as they were. Cost: mostly the profiling pass; on the
   * bench's 40-layer refit run the analysis took 2.5 s of CPU against 1.5 s without (median of
   * 3, in one process; was 4.3 s with a second whole pass for δ's σ and 13 delays); with the pass's
   * fits on 100 bin means, the profiles on 50 and no spectrum or gain drift σ in the pass, the pass
   * alone takes 0.38 s of CPU warm against 0.55 s (first call in a process 1.0–1.3 s against
   * 1.4–1.7 s), the analysis 0.45–0.50 s more than without against 0.6–0.7 s (medians of 5–6
   * runs in one process on a shared machine, load 3–7 on 2 cores). @default true
   */
  startTransient?: boolean;
  /**
   * The start transient (above) also where every layer is cut on level and the trace has a layer
   * column: δ profiled in each chip's final joint fit with the lamp drift refitted under its prior
   * at every δ (fit/jointStartDelay.ts; the layer-by-layer profiles hold the drift, which on a
   * level cut bends the curve as a slow start does), in a first pass in refit mode, kept where the
   * χ² falls by more than 1 (δ̂ about 1σ past 0) and a grid point past 0 lies below δ = 0. Where kept, every layer is fitted on δ's clock
   * with its σ carried in refit, which fits the drift under its prior (lampDriftFit) as the profile
   * did; sequential holds each chip's drift at the profile's γ(δ̂), its σ widened by γ's change
   * over ±σ_δ, and fits its level cuts on real time (on δ̂'s clock each layer's own fit took δ's
   * error into its thickness: seeds 21–30 max 3.64 → 2.22 %). Where not kept, or with the option
   * off, the profile still runs and the layers stay on real time, the δ it allows (√(δ̂² + σ²),
   * fit/startDelay.ts unresolvedLevelDelaySigma) carried into their σ, with the note on the delay
   * in every such run's warnings (real-chamber BBAR refit seeds 21–40: index within 3σ 91.7 →
   * 98.3 %, estimates unchanged). Off by default, measured on the
   * chamber simulator: real-chamber BBAR (ramp 1.5 s, lamp −1 %/h) refit 2.56 → 1.47 %, index
   * 0.035 → 0.015, sequential 1.03 → 1.49 %, index 0.030 → 0.0060, cut 1.34 → 1.20 % QWOT,
   * coverage 100 %; on 20 seeds (21–40) refit max 3.79 → 3.67 %, RMS 2.24 → 1.12 %, index max
   * 0.040 → 0.036, RMS 0.024 → 0.0105, coverage 80/55/80 → 79/56/80 of 80/60/80; sequential max
   * 2.61 → 2.56 %, RMS 1.12 → 0.93 %, index max 0.031 → 0.030, RMS 0.020 → 0.011, thin layers
   * RMS 1.85 → 2.03 %, coverage 100 %. Not by default: the chip's drift is read to 0.3–0.45 %/h
   * (layer 4's index moves 0.03 per %/h), so with the lamp held still in the simulator (12 seeds)
   * the index RMS goes 0.0035 → 0.011 (sequential), 0.0045 → 0.009 (refit); white-noise BBAR keeps
   * 0.26 and 0.38 s on seeds 17 and 20 of 11–20 (γ +0.24, +0.27 %/h: a false δ moves γ about
   * 0.45 %/h a second through the last layer's shape), refit max 0.27 → 0.78 %, index 0.0029 →
   * 0.0099; with the ramp off (12 seeds) one run keeps 0.71 ± 0.47 s; thin level cuts in R keep
   * 0.41 ± 0.25 s on seed 78 of 71–80 (layer 5 −0.30 → −1.86 %); the demo's bay2-bb4-run0587 (ramp and lamp
   * drift held back) keeps none. Cost: a
   * pass in refit mode and seven joint fits per chip, in place of the layer-by-layer pass (which
   * profiles nothing on level cuts). On by default where the trace has a reference column (option
   * lampReference, fit/lampReference.ts): the drift's prior there is 0.1 %/h, so γ no longer
   * takes up a false δ; real-chamber BBAR with a lamp reference, refit seeds 21–36: index max
   * 0.0119 → 0.0090, RMS 0.0047 → 0.0039, layer 2's (0.41 QWOT) index bias +0.0085 → +0.0033, as
   * with the simulator's ramp off; thickness RMS 0.57 → 0.68 %, max 1.68 → 2.66 % (layer 4, cut
   * on level just past its turning point, −0.44 → −0.64 % on average, −0.76 % with the ramp off:
   * the unmodelled ramp had offset its own bias); sequential unchanged (1.65 → 1.64 %, index
   * 0.0092). @default false (true with a reference column)
   */
  levelStartTransient?: boolean;
  /**
   * Sequential mode, where option levelStartTransient keeps a start delay δ̂ on a run cut only on
   * level: each level cut's own fit on δ̂'s exposure clock (fit/startTransient.ts), δ's σ carried
   * (fit/startDelaySigma.ts), instead of on real time with only the chip's drift held at the
   * profile's γ(δ̂). On real time a layer's law d = r·τ + a·τ²/2 starts at the logged start and
   * takes the start-up's lag of about r·δ into its rate and end. Measured on the chamber
   * simulator's four-layer AR with a lamp reference (ramp 1.5 s), sequential, seeds 21–36: layer 1
   * (0.22 QWOT) n·d −1.61 → −0.18 % on average (RMS 1.79 → 0.90 %), layer 2 (0.41 QWOT) +1.56 →
   * +1.01 %, index +0.0082 → +0.0038, layer 4 +0.55 → −0.53 % (RMS 0.96 → 0.79 %; the ramp had
   * offset its own bias, as in refit), thickness max 1.64 → 2.00 %, RMS 0.69 → 0.57 %, index
   * 0.0084 → 0.0079, cut 1.63 → 1.97 % QWOT, coverage 100 %; seeds 37–52 max 2.79 → 1.16 %, RMS
   * 0.98 → 0.42 %, index 0.0124 → 0.0096, cut 2.46 → 1.92 % QWOT. Not without a reference: there
   * the drift's prior of 1 %/h lets γ take up δ's error (real-chamber BBAR with levelStartTransient,
   * seeds 21–36: layer 4 max 2.56 → 3.89 %, RMS 1.25 → 1.63 %, though layer 1 −1.27 → −0.10 %).
   * @default false (true with a reference column, fit/lampReference.ts)
   */
  sequentialLevelClock?: boolean;
  /** …or when its trial fit's index σ exceeds this. @default 0.05 */
  heldIndexSigma?: number;
  /** The index a thin layer is held at: the nominal, or this run's drift estimate. @default 'run-drift' */
  heldIndex?: 'nominal' | 'run-drift';
  /**
   * Residual RMS above this multiple of the noise reference draws a warning. The reference is
   * the idle stretches' noise (white + AR(1), fit/idleNoiseModel.ts) when they hold ≥ 1000 lit
   * samples, else the run's median layer residual (≥ 3 layers), else the idle noise from 100 lit
   * samples on. @default 1.5
   */
  residualWarnFactor?: number;
  /** |cut error| above this (% QWOT) draws a warning. @default 2 */
  cutErrorWarnPct?: number;
  /** Wavelength range of the as-built spectrum. @default { fromNm: 400, toNm: 800, stepNm: 2 } */
  spectrum?: { fromNm: number; toNm: number; stepNm: number };
  /** Also return the fitted model at every trace sample (AnalysisResult.model). @default false */
  modelSeries?: boolean;
  /**
   * Look for periodic disturbances through the whole run (a lamp's ripple aliased by the sampling,
   * the holder's rotation) in all the layers' residuals together, and warn of each line found
   * (fit/runDisturbances.ts). @default true
   */
  runDisturbances?: boolean;
  /**
   * Without a reference column, where the run's residuals show a line (runDisturbances), read a
   * lamp ripple at it from them, divide it out of the signal and analyse the run again
   * (fit/analyzeRun.ts withRippleDivided). @default true
   */
  rippleDivide?: boolean;
  /** Called after each layer's fit. */
  onProgress?: (layersDone: number, layerCount: number) => void;
  /**
   * Computes a layer's spectrum (fit/layerSpectrum.ts, from its samples only) elsewhere, e.g. on
   * another thread. When given, every layer's is asked for before the first fit, so they are
   * ready as the fits reach them; it must resolve to what layerSpectrum would return. Given
   * `work`, it may add what layerSampleWork returns for it (the turning points the samples show,
   * their bin means), which the fits and results then take.
   * @default layerSpectrum, in turn, on this thread
   */
  spectrumOf?: (tauS: Float64Array, y: Float64Array, wavelengthNm: number, index: number, work?: SampleWork) => Promise<LayerSpectrum & Partial<SampleWorkResult>>;
  /**
   * Computes a chip's start-delay profiles elsewhere, e.g. on another thread (the profiling pass
   * reads the profiles only once it is over); it must resolve to what profileFromRequest returns.
   * @default profileFromRequest, on this thread
   */
  startDelayProfileOf?: (request: StartDelayProfileRequest) => Promise<(StartDelayProfile | null)[]>;
  /**
   * Makes the pool-free part of a layer's wander choice (prepareRateWander) elsewhere, e.g. on
   * another thread, where the choice is read only once the pass's fits are done (refit with
   * rateWander off); the pass then finishes the choices in layer order on its variogram pool. It
   * must resolve to what wanderPrepFromRequest returns.
   * @default chooseRateWander, on this thread, as each layer is fitted
   */
  wanderPrepOf?: (request: WanderChoiceRequest) => Promise<WanderPrep>;
  /**
   * Sums a layer's squared residuals under its reported model elsewhere, e.g. on another thread,
   * for the layers' results (not with modelSeries); it must resolve to what
   * modelSquaredResiduals (fit/layerResult.ts) returns. Asked for every layer at once; awaited
   * from the last layer down, so a thread working from the first meets this one in the middle.
   * @default modelSquaredResiduals's sum, on this thread, in layerResult
   */
  modelResidualsOf?: (request: ModelResidualsRequest) => PromiseLike<number>;
  /**
   * Searches the run's residual series for periodic lines elsewhere, e.g. on another thread while
   * this one makes the layers' results; it must resolve to what runLinesFromRequest
   * (fit/runDisturbances.ts) returns. @default runLinesFromRequest, on this thread
   */
  runLinesOf?: (request: RunLinesRequest) => PromiseLike<SpectrumLine[]>;
  /**
   * Computes a chip's unmodelled-wander variances through its final joint fit (refit) elsewhere,
   * e.g. on another thread while this one fits the next chips; they are added to the layers' σ once
   * every chip is fitted. It must resolve to what wanderVariancesFromRequest (fit/wanderSigma.ts)
   * returns. @default wanderErrorVariances, on this thread, as each chip is fitted
   */
  wanderVariancesOf?: (request: WanderVariancesRequest) => PromiseLike<WanderErrorVariance[] | null>;
  /**
   * The trace's warnings that read its samples (trace/traceWarnings.ts), made elsewhere (e.g. on
   * another thread while the run is segmented and its start delay profiled): appended to
   * trace.warnings before the pass whose result is returned reads them.
   * @default none: trace.warnings already holds them (readTrace)
   */
  sampleWarnings?: PromiseLike<TraceWarning[]>;
}

export interface TurningPointAt {
  timeS: number;
  /** Modelled signal, fraction 0–1. */
  signal: number;
  kind: 'max' | 'min';
  thicknessNm: number;
}

export interface LayerResult {
  layer: number;
  material: string;
  chip: number;
  wavelengthNm: number;
  mode: 'R' | 'T';
  cut: 'turning-point' | 'level';
  designThicknessNm: number;
  /** QWOT of the design layer at the design's reference wavelength. */
  qwot: number;
  /** Deposited optical thickness in quarter-waves at the monitor wavelength. */
  qwotDeposited: number;
  thicknessNm: number;
  thicknessSigmaNm: number;
  /** Real index at the monitor wavelength. */
  index: number;
  indexSigma: number;
  nominalIndex: number;
  /** index − nominalIndex. */
  indexDeviation: number;
  indexHeld: boolean;
  /**
   * With AnalyzeOptions.indexGradient, on layers that had the trial: the index change from the
   * layer's bottom to its top (index is then the mean) and its 1σ; indexGradientKept tells whether
   * the layer was fitted as graded (else it was fitted uniform, and these are the trial's figures).
   */
  indexGradient?: number;
  indexGradientSigma?: number;
  indexGradientKept?: boolean;
  rateNmPerS: number;
  rateSigmaNmPerS: number;
  rateDriftNmPerS2: number;
  rateDriftSigmaNmPerS2: number;
  /** Detector gain during the layer (per-layer refinement of the chip calibration). */
  gain: number;
  /** (n·d − n_design·d_design)/(λ/4)·100 at the monitor wavelength, n_design the nominal index. */
  cutErrorQwotPct: number;
  cutErrorSigmaQwotPct: number;
  /** RMS of (reading − model)/gain over all the layer's samples: fraction of full scale. */
  residualRms: number;
  /** residualRms over the noise reference (see AnalyzeOptions.residualWarnFactor); ≈ 1 for a good fit. */
  residualToNoise: number;
  startTimeS: number;
  /** When the layer was cut: its last sample. */
  cutTimeS: number;
  /** When it should have been cut, from the fitted d(t): the modelled turning point (turning-point cut) or the target optical thickness (level cut); extrapolated beyond the data if need be. */
  idealCutTimeS: number | null;
  /** The last extremum of the fitted model within the layer. */
  lastTurningPoint: TurningPointAt | null;
  /** Extrema found in the data itself (hysteresis search on the smoothed signal), confirmed ones. */
  observedTurningPoints: number;
  /** The last extremum in the data (signal as a fraction, via the gain); unconfirmed when the layer was cut on it. */
  lastObservedTurningPoint: { timeS: number; signal: number; kind: 'max' | 'min'; confirmed: boolean } | null;
  /** The crystal's reading at the layer's end, where the trace has crystal_nm. */
  crystalNm: number | null;
  /** thicknessNm / crystalNm (tooling-factor check). */
  opticalToCrystalRatio: number | null;
  /** Dominant fringe frequency of the layer's signal (its amplitude spectrum, trace/fringeSpectrum); null under ~1.5 fringes. */
  fringeFrequencyHz: number | null;
  /** The rate that frequency implies, f·λ/(2n), nm/s: the fit's independent first guess. */
  fringeRateNmPerS: number | null;
  /** Periodic disturbances seen in the layer's spectrum; amplitude as a fraction of full scale. */
  disturbances: { frequencyHz: number; amplitude: number; note: string }[];
  sampleCount: number;
  fitPoints: number;
  iterations: number;
  converged: boolean;
  warnings: string[];
}

export interface ToolingCheck {
  material: string;
  layers: number[];
  meanRatio: number;
  ratioSigma: number;
}

export interface AnalysisResult {
  format: 'fringelog.analysis/1';
  mode: AnalysisMode;
  design: string;
  segmentsInferred: boolean;
  layers: LayerResult[];
  chips: ChipCalibration[];
  indexDrift: MaterialDrift[];
  tooling: ToolingCheck[];
  spectrum: { wavelengthNm: Float64Array; designR: Float64Array; designT: Float64Array; asBuiltR: Float64Array; asBuiltT: Float64Array };
  warnings: string[];
  /** With AnalyzeOptions.modelSeries: the modelled reading (detector units) at every trace sample, NaN outside fitted layers. */
  model?: Float64Array;
}
