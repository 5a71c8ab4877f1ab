// `npm run worker`: one analysis worker on the database in DATABASE_URL. Start as many as the
// machines have cores to spare, here or on other machines pointed at the same database.
import { startAnalysisWorker } from '../jobs/worker';
import { closeDb } from '../client';
import { sendAnalysisAlerts } from '../../app/_lib/alerts';
import { sendShiftDigest } from '../../app/_lib/shiftDigest';
import { registerShiftDigests } from '../jobs/shiftDigestSchedule';

// The worker is the app's composition root for analyses: it wires the tolerance alerts (app/_lib) in.
const boss = await startAnalysisWorker({
  hooks: { onStored: sendAnalysisAlerts },
  onOutcome: (o) => {
    if (o.state === 'done') console.log(`[fringelog] worker: analysis ${o.analysisId} done (${o.layers} layers, ${o.warnings} warning${o.warnings === 1 ? '' : 's'}${o.notes ? `, ${o.notes} note${o.notes === 1 ? '' : 's'}` : ''}, try ${o.attempt})`);
    if (o.state === 'failed') console.log(`[fringelog] worker: analysis ${o.analysisId} failed: ${o.error}`);
  },
  onLeaseEvent: (e) => {
    if (e.kind === 'retried') console.log(`[fringelog] worker: analysis ${e.analysisId} lost its worker; queued again`);
    else console.log(`[fringelog] worker: analysis ${e.analysisId} lost its worker: ${e.message}`);
  },
});
// The shift digests ride on the same pg-boss: each worker registers the schedules (an upsert).
await registerShiftDigests(boss, async (window) => {
  const mailed = await sendShiftDigest(window);
  console.log(`[fringelog] worker: ${window.shift} shift digest ${window.from.toISOString()}: ${mailed.length} mailed`);
});
console.log(`[fringelog] analysis worker ${process.pid} waiting for jobs`);

let stopping = false;
async function stop(): Promise<void> {
  if (stopping) return;
  stopping = true;
  // Finish the job in hand (up to the timeout); an unfinished one is retried by another worker.
  await boss.stop({ graceful: true, wait: true, timeout: 60_000 });
  await closeDb();
  process.exit(0);
}
process.on('SIGTERM', () => void stop());
process.on('SIGINT', () => void stop());
