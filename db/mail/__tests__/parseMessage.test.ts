import nodemailer from 'nodemailer';
import { describe, expect, it } from 'vitest';
import { decodeEncodedWords, decodeQuotedPrintable, parseMessage } from '../parseMessage';

/** Builds a real message with nodemailer's own MIME composer (no network: the stream transport). */
async function compose(subject: string, text: string): Promise<string> {
  const transport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'windows' });
  const info = await transport.sendMail({ from: 'a@larkspur.example', to: 'b@larkspur.example', subject, text, textEncoding: 'quoted-printable' });
  return (info.message as Buffer).toString('utf8');
}

describe('parseMessage', () => {
  it('reads back subject and body of a nodemailer message, long links unbroken', async () => {
    const link = `http://localhost:3000/set-password?token=${'x'.repeat(90)}`;
    const raw = await compose('You are invited to Fringelog', `Hello,\n\n${link}\n\nBye = done\n`);
    expect(raw).toMatch(/=\r\n/); // the composer really did fold the long line
    const parsed = parseMessage(raw);
    expect(parsed.subject).toBe('You are invited to Fringelog');
    expect(parsed.text).toContain(link);
    expect(parsed.text).toContain('Bye = done');
  });

  it('decodes non-ASCII subjects and bodies', async () => {
    const parsed = parseMessage(await compose('Schichtdicke – Prüfung', 'Grüße aus Bay 2 — λ = 550 nm'));
    expect(parsed.subject).toBe('Schichtdicke – Prüfung');
    expect(parsed.text.trim()).toBe('Grüße aus Bay 2 — λ = 550 nm');
  });

  it('handles a message with no body and plain 7bit text', () => {
    expect(parseMessage('Subject: hi\r\n\r\n')).toMatchObject({ subject: 'hi', text: '' });
    expect(parseMessage('Subject: a\r\n  folded\r\n\r\nbody line')).toMatchObject({ subject: 'a folded', text: 'body line' });
  });
});

describe('decoders (RFC 2045 §6.7, RFC 2047)', () => {
  it('quoted-printable: soft breaks vanish, =XX are bytes, UTF-8 is reassembled', () => {
    expect(decodeQuotedPrintable('a=3Db=\r\nc')).toBe('a=bc');
    expect(decodeQuotedPrintable('Gr=C3=BC=C3=9Fe')).toBe('Grüße');
    expect(decodeQuotedPrintable('50 =')).toBe('50 =');
  });

  it('encoded words in B and Q form', () => {
    expect(decodeEncodedWords('=?UTF-8?B?UHLDvGZ1bmc=?=')).toBe('Prüfung');
    expect(decodeEncodedWords('=?UTF-8?Q?Pr=C3=BCfung_heute?=')).toBe('Prüfung heute');
    expect(decodeEncodedWords('plain')).toBe('plain');
  });
});
