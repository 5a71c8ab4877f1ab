// The analysis's schemas (analysis/design/schema.ts, analysis/materials/schema.ts) are written with
// zod's mini build, which leaves out the classic build's method chains and loads no locale of its
// own: its messages come from here, English, as the classic build's. Why mini: the `analyze`
// command runs one bundle on each of its two threads, and the classic build was 0.75 MB of the
// 1.4 MB, about 25 ms of CPU on each thread to load and start (the mini's part 0.06 MB). The
// app's forms keep the classic build; the two share zod's core, and its configuration is one.
import * as z from 'zod/mini';
import { en } from 'zod/locales';

z.config(en());
