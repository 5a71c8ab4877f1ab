// `npm run bench`: each section prints its own figures; a benchmark is never a timed test.
// The upload section builds and serves the app against a database of its own (BENCH_APP_PORT, default 3200).
import { run as analysis } from './analysis';
import { run as optics } from './optics';
import { run as upload } from './upload';

for (const section of [optics, analysis, upload]) await section();
