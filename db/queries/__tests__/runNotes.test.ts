import { describe, expect, it } from 'vitest';
import { NOTE_OPENINGS as analysisOpenings, isAnalysisNote, warningCount, warningsInWords } from '@/analysis/fit/analysisNotes';
import { lampDriftNote } from '@/analysis/fit/lampDriftNote';
import { startDelayNote } from '@/analysis/fit/startDelaySigma';
import { NOTE_OPENINGS } from '../runNotes';

describe('the analysis\'s notes, apart from its warnings', () => {
  it('the run list\'s SQL reads the same openings as the analysis writes', () => {
    expect([...NOTE_OPENINGS]).toEqual([...analysisOpenings]);
  });

  it('a start-up delay\'s note is a note, kept or not; a layer\'s cut warning and a segmentation warning are warnings', () => {
    const pooled = { delayS: 0.4, sigmaS: 0.43, gainChi2: 0.9, dispersion: 1, marginChi2: 1, kept: false, layers: 1, shutterS: null };
    expect(isAnalysisNote(startDelayNote(pooled, 'chip'))).toBe(true);
    expect(isAnalysisNote(startDelayNote({ ...pooled, kept: true }, 'layer'))).toBe(true);
    const messages = [
      startDelayNote(pooled, 'layer'),
      'layer 2: cut thin (undershoot) by 2.5 % of a quarter-wave at 520 nm',
      'the trace has no layer column: 4 layer segments inferred from the design',
    ];
    expect(warningCount(messages)).toBe(2);
    expect(warningsInWords(messages)).toBe('2 warnings');
    expect(warningsInWords(messages.slice(0, 2))).toBe('1 warning');
  });

  it('the held lamp drift\'s note is a note', () => {
    const note = lampDriftNote([{ layer: 4, thicknessSigmaNm: 1, indexSigma: 0.01, indexHeld: false, shift: { index: 0.009, thicknessNm: 0.2, opticalNm: 0 } }], 0, 0.01);
    expect(note).not.toBeNull();
    expect(isAnalysisNote(note!)).toBe(true);
  });
});
