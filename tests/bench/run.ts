// `npm run bench`: each section prints its own figures; a benchmark is never a timed test.
import { run as analysis } from './analysis';
import { run as analyzeProcess } from './analyzeProcess';
import { run as compare } from './compare';
import { run as optics } from './optics';
import { run as runPage } from './runPage';
import { run as upload } from './upload';

for (const section of [optics, analysis, analyzeProcess, upload, compare, runPage]) await section();
