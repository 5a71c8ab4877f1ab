import 'server-only';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/db/env';

let transport: Transporter | undefined;

function transporter(): Transporter {
  transport ??= nodemailer.createTransport(env().SMTP_URL);
  return transport;
}

export async function sendMail(to: string, subject: string, text: string): Promise<void> {
  await transporter().sendMail({ from: env().MAIL_FROM, to, subject, text, textEncoding: 'quoted-printable' });
}

export function appLink(pathAndQuery: string): string {
  return new URL(pathAndQuery, env().APP_URL).toString();
}

export function inviteMail(name: string, inviterName: string, link: string): { subject: string; text: string } {
  return {
    subject: 'You are invited to Fringelog',
    text: `Hello ${name},\n\n${inviterName} invited you to Fringelog at Larkspur Optical Works.\nChoose your password here (the link works once and expires in 72 hours):\n\n${link}\n\nIf you did not expect this, ignore this message.\n`,
  };
}

export function resetMail(name: string, link: string): { subject: string; text: string } {
  return {
    subject: 'Reset your Fringelog password',
    text: `Hello ${name},\n\nSomeone asked to reset your Fringelog password. To choose a new one, open this link (it works once and expires in 1 hour):\n\n${link}\n\nIf this was not you, ignore this message; your password stays as it is.\n`,
  };
}
