import { type ChamberOptions } from '../options';
import { scenarios, type Mode, type Scenario } from '../scenarios';

/** Seeds from the command line: "15-30" (a range), "15,17,21" (a list), or the fallback. */
export function seedList(arg: string | undefined, fallback: number[]): number[] {
  if (!arg) return fallback;
  const range = /^(\d+)-(\d+)$/.exec(arg);
  if (range) return Array.from({ length: Number(range[2]) - Number(range[1]) + 1 }, (_, i) => Number(range[1]) + i);
  return arg.split(',').map(Number);
}

/**
 * A by-hand script's scenario, seeds and mode from its arguments ('scenario name' [seeds] [mode]),
 * the scenario's chamber changed by FRINGELOG_CHAMBER_OPTIONS (JSON) where set.
 */
export function scenarioFromArgs(argv: readonly string[], fallbackName: string): { scenario: Scenario; seeds: number[]; mode: Mode } {
  const name = argv[2] ?? fallbackName;
  const found = scenarios().find((s) => s.name === name);
  if (!found) throw new Error(`no scenario named '${name}'`);
  const chamber = process.env.FRINGELOG_CHAMBER_OPTIONS;
  const scenario = chamber ? { ...found, options: { ...found.options, ...(JSON.parse(chamber) as ChamberOptions) } } : found;
  return { scenario, seeds: seedList(argv[3], scenario.seeds), mode: (argv[4] ?? 'refit') as Mode };
}
