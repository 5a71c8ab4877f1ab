import { cutPlan } from '../design/cutPlan';
import { loadDesignFile, parseFlags, requireFlag, runCli } from './args';

const USAGE = 'npm run --silent plan -- --design FILE';

/** shared/FORMATS.md `plan`: { layers: [...] }, each layer with the FORMATS keys plus the PlanLayer extras. */
export function planCommand(argv: string[]) {
  const flags = parseFlags(argv, ['design'], USAGE);
  const design = loadDesignFile(requireFlag(flags, 'design', USAGE));
  return { design: design.name, layers: cutPlan(design) };
}

// (runCli settles every error itself; not awaited: the launcher runs the bundle as a script)
void runCli('plan', planCommand);
