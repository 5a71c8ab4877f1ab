export type DispositionValue = 'accepted' | 'on_hold' | 'rejected';

/** Fringelog's own words for the three states, and a shape beside each so colour is not the only cue. */
export const dispositionLooks: Record<DispositionValue, { word: string; glyph: string; box: string }> = {
  accepted: { word: 'Good to ship', glyph: '✓', box: 'border-leaf/40 bg-leaf-light text-leaf' },
  on_hold: { word: 'Held for review', glyph: '‖', box: 'border-brass/40 bg-brass-light text-brass-dark' },
  rejected: { word: 'Not to ship', glyph: '✕', box: 'border-alarm/40 bg-alarm-light text-alarm' },
};
