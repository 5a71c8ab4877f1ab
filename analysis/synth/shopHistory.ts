import { type SynthOptions } from './types';

/** One planned run of the demo shop's history: where, when, by whom, and what really happened in it. */
export interface HistoryRun {
  runCode: string;
  /** Design file of sample-traces/. */
  designFile: string;
  chamber: string;
  shift: 'early' | 'day' | 'night';
  operator: string;
  startedAt: Date;
  options: SynthOptions;
}

export interface HistoryStories {
  /** The shift that cuts `layer` of `designFile` late, and by how much (fraction of its thickness). */
  lateShift: { shift: HistoryRun['shift']; designFile: string; layer: number; overshoot: number };
  /** The chamber whose high-index material (H) drifts, index units per week from the first day. */
  drift: { chamber: string; material: string; perWeek: number };
  /** The chamber whose crystal tooling factor for H steps after maintenance. */
  toolingStep: { chamber: string; material: string; before: number; after: number; maintenance: Date };
}

const SHIFTS = [
  { shift: 'early', hourUtc: 6, operator: 'Ines Varga' },
  { shift: 'day', hourUtc: 14, operator: 'Tomasz Quill' },
  { shift: 'night', hourUtc: 22, operator: 'Priya Oyelaran' },
] as const;

const CHAMBERS = [
  { name: 'Bay 1 e-beam', code: 'B1', firstNumber: 340, tooling: { H: 1.04, L: 0.98 } },
  { name: 'Bay 2 IAD', code: 'B2', firstNumber: 520, tooling: { H: 1.06, L: 0.97 } },
  { name: 'Bay 3 sputter', code: 'B3', firstNumber: 1060, tooling: null },
] as const;

/** Invented history: Monday 7 September to Friday 30 October 2026, before the sample runs of November. */
export const HISTORY_START = new Date('2026-09-07T00:00:00Z');
export const HISTORY_WEEKS = 8;

export const historyStories: HistoryStories = {
  lateShift: { shift: 'night', designFile: 'bbar4-visible.json', layer: 3, overshoot: 0.015 },
  drift: { chamber: 'Bay 3 sputter', material: 'H', perWeek: -0.0035 },
  toolingStep: { chamber: 'Bay 1 e-beam', material: 'H', before: 1.04, after: 1.09, maintenance: new Date('2026-10-12T00:00:00Z') },
};

/**
 * Eight weeks of the invented shop Larkspur Optical Works: the four-layer AR in all three
 * chambers on three shifts (three runs in four working days per chamber), the one-layer MgF₂ AR
 * in Bay 1 on Fridays, with the stories of `historyStories` built in. Deterministic: each run's
 * seed is its number. `sampleIntervalS` keeps traces short so the demo seeds quickly.
 */
export function shopHistory(stories: HistoryStories = historyStories, sampleIntervalS = 0.5): HistoryRun[] {
  const out: HistoryRun[] = [];
  const numbers = CHAMBERS.map((c) => c.firstNumber);
  for (let day = 0; day < HISTORY_WEEKS * 7; day++) {
    const weekday = day % 7;
    if (weekday > 4) continue;
    const workday = Math.floor(day / 7) * 5 + weekday;
    CHAMBERS.forEach((chamber, c) => {
      const friday = weekday === 4;
      const ar1 = friday && c === 0;
      if (!ar1 && (workday + c) % 4 === 3) return;
      const s = SHIFTS[(workday + c) % 3];
      const date = new Date(HISTORY_START.getTime() + day * 86400e3);
      const startedAt = new Date(date.getTime() + s.hourUtc * 3600e3);
      const number = numbers[c]++;
      const runCode = `${chamber.code}-${String(number).padStart(4, '0')}`;
      const designFile = ar1 ? 'ar1-mgf2-crown.json' : 'bbar4-visible.json';
      const weeks = (startedAt.getTime() - HISTORY_START.getTime()) / (7 * 86400e3);
      const options: SynthOptions = {
        seed: 100000 + c * 10000 + number,
        sampleIntervalS,
        gain: 0.9 + 0.05 * c,
        settleS: 3,
        bareChipS: 15,
        meta: {
          shop: 'Larkspur Optical Works', chamber: chamber.name, run: runCode, operator: s.operator, shift: s.shift,
          date: date.toISOString().slice(0, 10), synthetic: 'yes (analysis/synth/shopHistory.ts)',
        },
      };
      if (ar1) {
        options.defaultRateNmPerS = 0.8;
        options.meta!.monitor_wavelength_nm = '550';
      } else {
        options.rateNmPerS = { H: 0.35, L: 0.7 };
        options.meta!.monitor_wavelength_nm = '520';
        if (chamber.tooling) {
          const step = stories.toolingStep;
          const tooling: Record<string, number> = { ...chamber.tooling };
          if (chamber.name === step.chamber) tooling[step.material] = startedAt >= step.maintenance ? step.after : step.before;
          options.tooling = tooling;
        }
      }
      if (chamber.name === stories.drift.chamber && !ar1) options.indexOffset = { [stories.drift.material]: stories.drift.perWeek * weeks };
      if (s.shift === stories.lateShift.shift && designFile === stories.lateShift.designFile) {
        options.overshoot = { [stories.lateShift.layer]: stories.lateShift.overshoot };
      }
      out.push({ runCode, designFile, chamber: chamber.name, shift: s.shift, operator: s.operator, startedAt, options });
    });
  }
  return out;
}
