import { describe, expect, it } from 'vitest';
import { analysisSettingsSchema } from '@/db/jobs/analysisSettings';
import { describeSettings } from '../describeSettings';

describe('analysis settings', () => {
  it('takes the chamber-effect options a re-analysis may ask for and names each in the list of analyses', () => {
    const s = analysisSettingsSchema.parse({ mode: 'refit', rateWander: true, startTransient: true, indexGradient: true, growthFromNext: false });
    expect(describeSettings(s)).toBe(
      "refit · rate wander within layers · rate's start-up at the shutter · index gradient in thick layers · growth after turning-point cuts in σ only",
    );
    expect(describeSettings({ mode: 'sequential' })).toBe('sequential');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', levelStartTransient: true, holdUncarriedDrift: false }))).toBe(
      'refit · start-up on level cuts · every rate drift free',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', startTransient: false }))).toBe('sequential · no start-up at the shutter');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', levelCutGain: 'free' }))).toBe('sequential · own gain on level-cut layers');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', lampDriftFit: true, lampStabilityPerHour: 0.005 }))).toBe(
      "refit · gain drift fitted under the lamp's stability · lamp stability 0.5 %/h",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', turningPointOvershootPct: 0.3 }))).toBe('refit · turning-point overshoot up to 0.3 %');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', turningPointExcessMean: false }))).toBe(
      'sequential · turning-point cuts placed on the turning point',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', pooledIndex: false }))).toBe('refit · each index read alone');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', levelGrowthFromNext: false }))).toBe('refit · growth after level cuts from the idle level only');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', levelGrowthFromNext: true }))).toBe('refit');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', fitOnFinalStack: false }))).toBe('sequential · each layer fitted once');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', heldIndexLevelCut: false }))).toBe('refit · thick level-cut layers\' indices always free');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', fitWithNextLayer: false }))).toBe('sequential · each level cut fitted alone');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', fitWithNextLayer: true }))).toBe('sequential');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', stackFromLayer: true }))).toBe('sequential · stack below read again with each layer');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', lampReference: false }))).toBe('refit · lamp reference column not used');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', cutPastTurningPoint: false }))).toBe(
      "sequential · chips' last turning-point cuts not held past the turning point",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', cutPastTurningPoint: 'refit' }))).toBe(
      "sequential · chips' last turning-point cuts held past the turning point in the joint re-fit only",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', cutPastTurningPoint: true }))).toBe('refit');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', reflectanceChipGain: false, offsetAveraging: false, offsetAdoptionSigma: 2 }))).toBe(
      'sequential · own gain per layer in reflectance · fitted offset taken or left by a threshold · fitted offset taken beyond 2 σ',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', unmeasuredOffsetSigma: 0.005, levelStartTransient: false }))).toBe(
      'refit · unmeasured offset σ 0.5 % of full scale · no start-up on level cuts',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', levelStartTransient: true, sequentialLevelClock: false }))).toBe(
      'sequential · start-up on level cuts · level cuts on real time layer by layer',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', sequentialLevelClock: true }))).toBe(
      "sequential · level cuts on the start-up's clock layer by layer",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', shutterTimeGrowth: 'run-mean' }))).toBe(
      "sequential · last layers' growth at the run's shutter time",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', shutterTimePopulation: 'mixture' }))).toBe(
      'refit · shutter times cut at 0, with their uncertainty',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', overshootPopulation: 'uniform' }))).toBe(
      "sequential · last cuts' overshoot uniform, not from the run",
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', overshootPopulation: 'mixture' }))).toBe('refit');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', shutterTimePopulation: 'normal' }))).toBe('refit');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', rippleDivide: false }))).toBe('refit · a lamp ripple found through the run named, not divided out');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'sequential', runDisturbances: false, rippleDivide: false }))).toBe(
      'sequential · no search for a periodic disturbance through the run',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', runDisturbances: true, rippleDivide: true }))).toBe('refit');
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', detectorLinearity: { lowPct: 0.5, atReading: 1.94 } }))).toBe(
      'refit · detector linearised: 0.5 % low at a reading of 1.94',
    );
    expect(describeSettings(analysisSettingsSchema.parse({ mode: 'refit', detectorLinearity: { lowPct: 0, atReading: 1 } }))).toBe('refit');
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', detectorLinearity: { lowPct: 0.5, atReading: 0 } }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', detectorLinearity: { lowPct: 25, atReading: 1 } }).success).toBe(false);
  });

  it('refuses an option the fit does not know, and a wrong type', () => {
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', rampModel: true }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', startTransient: 'yes' }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'sequential', levelCutGain: 'fitted' }).success).toBe(false);
    // a lamp "stability" of 50 %/h is a typing slip (per cent entered as a fraction's worth)
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', lampStabilityPerHour: 0.5 }).success).toBe(false);
    // an overshoot past a turning point of more than 10 % of the layer is no turning-point cut
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', turningPointOvershootPct: 25 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', turningPointOvershootPct: -1 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', offsetAdoptionSigma: -1 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', offsetAveraging: 'yes' }).success).toBe(false);
    // an unseen offset of more than 5 % of full scale is a per cent typed as a fraction
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', unmeasuredOffsetSigma: 0.3 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', unmeasuredOffsetSigma: -0.001 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', shutterTimeGrowth: 'free' }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', cutPastTurningPoint: 'on' }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'sequential', fitWithNextLayer: 3 }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', levelGrowthFromNext: 'on' }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', shutterTimePopulation: 'uniform' }).success).toBe(false);
    expect(analysisSettingsSchema.safeParse({ mode: 'refit', overshootPopulation: 'normal' }).success).toBe(false);
  });
});
