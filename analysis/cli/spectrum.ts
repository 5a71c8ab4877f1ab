import { designSpectrum } from '../design/designSpectrum';
import { choiceFlag, loadDesignFile, numberFlag, parseFlags, requireFlag, runCli } from './args';

const USAGE = 'npm run --silent spectrum -- --design FILE [--from 400] [--to 800] [--step 1] [--angle 0] [--pol s|p|mean]';

/** shared/FORMATS.md `spectrum`: { wavelengthNm, R, T } of the design as specified. */
export function spectrumCommand(argv: string[]) {
  const flags = parseFlags(argv, ['design', 'from', 'to', 'step', 'angle', 'pol'], USAGE);
  const file = requireFlag(flags, 'design', USAGE);
  const options = {
    fromNm: numberFlag(flags, 'from', 400),
    toNm: numberFlag(flags, 'to', 800),
    stepNm: numberFlag(flags, 'step', 1),
    angleDeg: numberFlag(flags, 'angle', 0),
    pol: choiceFlag(flags, 'pol', ['s', 'p', 'mean'] as const, 'mean'),
  };
  if (!(options.angleDeg >= 0 && options.angleDeg < 90)) throw new RangeError(`--angle must be in [0, 90) degrees (got ${options.angleDeg})`);
  const design = loadDesignFile(file);
  const { wavelengthNm, R, T } = designSpectrum(design, options);
  return { wavelengthNm, R, T };
}

// (runCli settles every error itself; not awaited: the launcher runs the bundle as a script)
void runCli('spectrum', spectrumCommand);
