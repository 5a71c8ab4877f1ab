import 'server-only';
import { getIronSession, type SessionOptions } from 'iron-session';
import { cookies } from 'next/headers';
import { env } from '@/db/env';

export type SessionData = { userId?: number; sessionVersion?: number };

export const SESSION_COOKIE = 'fringelog_session';
const TWELVE_HOURS_S = 12 * 60 * 60;

function options(): SessionOptions {
  const e = env();
  return {
    password: e.SESSION_SECRET,
    cookieName: SESSION_COOKIE,
    ttl: TWELVE_HOURS_S,
    cookieOptions: {
      httpOnly: true,
      sameSite: 'lax',
      secure: e.APP_URL.startsWith('https://'),
      path: '/',
    },
  };
}

export async function getSession() {
  return getIronSession<SessionData>(await cookies(), options());
}
