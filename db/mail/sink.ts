import 'server-only';
import { SMTPServer } from 'smtp-server';
import { storeCaughtMail } from '../queries/mail';
import { parseMessage } from './parseMessage';

export type MailSink = { port: number; close(): Promise<void> };

/**
 * A fake SMTP server on loopback that accepts every message and stores it in caught_mail,
 * so the admin mail page can show it. For development and tests only.
 */
export async function startMailSink(port: number, host = '127.0.0.1'): Promise<MailSink> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Fringelog local mail sink',
    size: 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const parsed = parseMessage(raw);
        storeCaughtMail({
          envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          envelopeTo: session.envelope.rcptTo.map((r) => r.address),
          subject: parsed.subject,
          textBody: parsed.text,
          raw,
        }).then(
          () => callback(),
          (err: unknown) => callback(err instanceof Error ? err : new Error(String(err))),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === 'object' && address ? address.port : port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
