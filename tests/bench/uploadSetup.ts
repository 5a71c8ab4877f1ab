// Prepares the bench database for tests/bench/upload.ts (run with tsx --conditions=react-server):
// migrations, the demo chambers and people, one 8-layer design and the chamber token in
// FRINGELOG_DEMO_TOKEN. No sample runs: the bench uploads its own.
import path from 'node:path';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { closeDb, db } from '../../db/client';
import { startBoss } from '../../db/jobs/queue';
import { ensureDemoChamberToken } from '../../db/queries/chamberTokens';
import { createDesignRevision } from '../../db/queries/designs';
import { seedSteps } from '../../db/seed/demo';
import { benchDesignDocument } from './benchDesign';
import { parseDesign } from '../../analysis/design';

await migrate(db(), { migrationsFolder: path.resolve(import.meta.dirname, '..', '..', 'drizzle') });
for (const step of seedSteps.filter((s) => s.key === 'seed:chambers' || s.key === 'seed:users')) await step.run(db());
const design = parseDesign(benchDesignDocument);
await createDesignRevision({ document: benchDesignDocument, name: design.name, referenceWavelengthNm: design.referenceWavelengthNm, layerCount: design.layers.length, createdBy: null });
await (await startBoss({ supervise: false, schedule: false })).stop({ graceful: false, wait: true });
await ensureDemoChamberToken(process.env.FRINGELOG_DEMO_TOKEN ?? '');
await closeDb();
