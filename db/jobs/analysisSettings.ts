import { z } from 'zod';

/**
 * The settings an analysis may be queued with: the options of analysis/fit AnalyzeOptions that
 * change the physics of the fit. Stored as the analysis's `settings` and handed to analyzeRun.
 */
export const analysisSettingsSchema = z
  .object({
    mode: z.enum(['sequential', 'refit']),
    gain: z.enum(['per-layer', 'chip']).optional(),
    gainDrift: z.boolean().optional(),
    gainDriftFromChips: z.boolean().optional(),
    heldIndex: z.enum(['nominal', 'run-drift']).optional(),
    thinLayerQwot: z.number().min(0).max(4).optional(),
  })
  .strict();
export type AnalysisSettings = z.infer<typeof analysisSettingsSchema>;

/** Words for a settings object, for lists ("refit · gain per chip · thin layers held at nominal"). */
export function describeSettings(s: Record<string, unknown>): string {
  const parts = [String(s.mode ?? '')];
  if (s.gain === 'chip') parts.push('one gain per chip');
  if (s.gain === 'per-layer') parts.push('gain per layer');
  if (s.gainDrift === true) parts.push('gain drift fitted');
  if (s.gainDriftFromChips === false) parts.push('no chip-to-chip gain drift');
  if (s.heldIndex === 'nominal') parts.push('thin layers held at the nominal index');
  if (s.heldIndex === 'run-drift') parts.push("thin layers held at the run's drift index");
  if (typeof s.thinLayerQwot === 'number') parts.push(`held below ${s.thinLayerQwot} QWOT`);
  return parts.join(' · ');
}
