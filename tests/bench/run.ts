// `npm run bench`: each section prints its own figures; a benchmark is never a timed test.
import { run as analysis } from './analysis';
import { run as analyzeProcess } from './analyzeProcess';
import { run as optics } from './optics';

for (const section of [optics, analysis, analyzeProcess]) await section();
