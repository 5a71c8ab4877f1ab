import { z } from 'zod';

/**
 * The settings an analysis may be queued with: the options of analysis/fit AnalyzeOptions that
 * change the physics of the fit. Stored as the analysis's `settings` and handed to analyzeRun.
 */
export const analysisSettingsSchema = z
  .object({
    mode: z.enum(['sequential', 'refit']),
    gain: z.enum(['per-layer', 'chip']).optional(),
    levelCutGain: z.enum(['calibration', 'free']).optional(),
    gainDrift: z.boolean().optional(),
    lampStabilityPerHour: z.number().min(0).max(0.2).optional(),
    lampDriftFit: z.boolean().optional(),
    lampReference: z.boolean().optional(),
    gainDriftFromChips: z.boolean().optional(),
    fitOffset: z.boolean().optional(),
    offsetAdoptionSigma: z.number().min(0).max(10).optional(),
    offsetAveraging: z.boolean().optional(),
    unmeasuredOffsetSigma: z.number().min(0).max(0.05).optional(),
    reflectanceChipGain: z.boolean().optional(),
    heldIndex: z.enum(['nominal', 'run-drift']).optional(),
    thinLayerQwot: z.number().min(0).max(4).optional(),
    rateWander: z.boolean().optional(),
    startTransient: z.boolean().optional(),
    levelStartTransient: z.boolean().optional(),
    sequentialLevelClock: z.boolean().optional(),
    holdUncarriedDrift: z.boolean().optional(),
    indexGradient: z.boolean().optional(),
    growthFromNext: z.boolean().optional(),
    levelGrowthFromNext: z.boolean().optional(),
    shutterTimeGrowth: z.enum(['bounded', 'run-mean']).optional(),
    shutterTimePopulation: z.enum(['normal', 'truncated', 'mixture']).optional(),
    overshootPopulation: z.enum(['uniform', 'truncated', 'mixture']).optional(),
    turningPointOvershootPct: z.number().min(0).max(10).optional(),
    turningPointExcessMean: z.boolean().optional(),
    pooledIndex: z.boolean().optional(),
    heldIndexLevelCut: z.boolean().optional(),
    fitOnFinalStack: z.boolean().optional(),
    fitWithNextLayer: z.boolean().optional(),
    stackFromLayer: z.boolean().optional(),
    cutPastTurningPoint: z.union([z.boolean(), z.literal('refit')]).optional(),
    runDisturbances: z.boolean().optional(),
    rippleDivide: z.boolean().optional(),
    detectorLinearity: z.object({ lowPct: z.number().min(0).max(20), atReading: z.number().positive() }).strict().optional(),
  })
  .strict();
export type AnalysisSettings = z.infer<typeof analysisSettingsSchema>;
