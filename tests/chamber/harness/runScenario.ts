// The harness side: runs the project's reader and analysis on the simulator's traces.
// (It imports analysis/; the simulator files one folder up never do.)
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalysisResult } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun, type ChamberRun } from '..';
import { type Mode, type Scenario } from '../scenarios';

export interface ScenarioRun {
  seed: number;
  run: ChamberRun;
  results: Partial<Record<Mode, AnalysisResult>>;
}

export async function runScenario(scenario: Scenario, seed: number, modes: Mode[]): Promise<ScenarioRun> {
  const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
  const design = parseDesign(scenario.design, `${scenario.name}.json`);
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${scenario.name} seed ${seed}.csv`, layerCount: design.layers.length });
  const results: ScenarioRun['results'] = {};
  for (const mode of modes) results[mode] = await analyzeRun(design, trace, { mode });
  return { seed, run, results };
}
