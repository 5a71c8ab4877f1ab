// Runs the local SMTP sink as its own process (started by npm start / npm test).
import { closeDb } from '../client';
import { startMailSink } from '../mail/sink';

const port = Number(process.env.MAIL_SINK_PORT ?? 2525);
const sink = await startMailSink(port);
console.log(`[fringelog] mail sink listening on 127.0.0.1:${sink.port}`);

async function stop() {
  await sink.close();
  await closeDb();
  process.exit(0);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
