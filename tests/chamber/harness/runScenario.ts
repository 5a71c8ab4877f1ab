// The harness side: runs the project's reader and analysis on the simulator's traces.
// (It imports analysis/; the simulator files one folder up never do.)
import { parseDesign } from '@/analysis/design';
import { AnalysisInputError, analyzeRun, type AnalysisResult, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun, type ChamberRun } from '..';
import { type Mode, type Scenario } from '../scenarios';

export interface ScenarioRun {
  seed: number;
  run: ChamberRun;
  results: Partial<Record<Mode, AnalysisResult>>;
  /** The message of an analysis that failed on its input (e.g. a design layer without a segment). */
  failures: Partial<Record<Mode, string>>;
}

/**
 * Options added to every analysis, from FRINGELOG_ACCURACY_OPTIONS (JSON), for measuring an
 * option across the scenarios by hand (e.g. '{"rateWander":true}'); CI never sets it.
 */
function extraOptions(): AnalyzeOptions {
  const raw = process.env.FRINGELOG_ACCURACY_OPTIONS;
  return raw ? (JSON.parse(raw) as AnalyzeOptions) : {};
}

/** `options` go to every analysis after FRINGELOG_ACCURACY_OPTIONS (a test isolating one option). */
export async function runScenario(scenario: Scenario, seed: number, modes: Mode[], options: AnalyzeOptions = {}): Promise<ScenarioRun> {
  const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
  const design = parseDesign(scenario.design, `${scenario.name}.json`);
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${scenario.name} seed ${seed}.csv`, layerCount: design.layers.length });
  const results: ScenarioRun['results'] = {};
  const failures: ScenarioRun['failures'] = {};
  for (const mode of modes) {
    try {
      results[mode] = await analyzeRun(design, trace, { ...extraOptions(), ...options, mode });
    } catch (e) {
      if (!(e instanceof AnalysisInputError)) throw e;
      failures[mode] = e.message;
    }
  }
  return { seed, run, results, failures };
}
