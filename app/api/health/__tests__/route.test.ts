import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { DbHealth } from '@/db/queries/health';
import type { PublicUser } from '@/db/queries/users';

const state: { health: DbHealth; user: Pick<PublicUser, 'role'> | null } = { health: { ok: true, latencyMs: 1.5, migrations: 1, serverVersion: '15' }, user: null };
vi.mock('@/db/queries/health', () => ({ databaseHealth: async () => state.health }));
vi.mock('@/app/_lib/auth', () => ({ currentUser: async () => state.user }));

const { GET } = await import('../route');

describe('GET /api/health', () => {
  beforeEach(() => {
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    state.health = { ok: true, latencyMs: 1.5, migrations: 1, serverVersion: '15' };
  });

  it('says only "up" to a visitor or a non-admin, without the server version or migrations', async () => {
    for (const user of [null, { role: 'supervisor' as const }]) {
      state.user = user;
      const res = await GET();
      expect(res.status).toBe(200);
      expect(res.headers.get('cache-control')).toBe('no-store');
      expect(await res.json()).toEqual({ status: 'up' });
    }
  });

  it('gives a signed-in admin the database details', async () => {
    state.user = { role: 'admin' };
    expect(await (await GET()).json()).toEqual({ status: 'up', database: state.health });
  });

  it('answers 503 "down" without the driver message, to admins too', async () => {
    state.user = { role: 'admin' };
    state.health = { ok: false, error: 'connect ECONNREFUSED 127.0.0.1:54329 password=secret' };
    const res = await GET();
    expect(res.status).toBe(503);
    const body = await res.text();
    expect(JSON.parse(body)).toEqual({ status: 'down' });
    expect(body).not.toContain('ECONNREFUSED');
  });
});
