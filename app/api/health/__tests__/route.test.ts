import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { DbHealth } from '@/db/queries/health';

const state: { health: DbHealth } = { health: { ok: true, latencyMs: 1.5, migrations: 1, serverVersion: '15' } };
vi.mock('@/db/queries/health', () => ({ databaseHealth: async () => state.health }));

const { GET } = await import('../route');

describe('GET /api/health', () => {
  beforeEach(() => {
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
  });

  it('answers 200 with the database state when it is reachable', async () => {
    state.health = { ok: true, latencyMs: 1.5, migrations: 1, serverVersion: '15' };
    const res = await GET();
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect(await res.json()).toEqual({ status: 'ok', database: state.health });
  });

  it('answers 503 without leaking the driver message when it is not', async () => {
    state.health = { ok: false, error: 'connect ECONNREFUSED 127.0.0.1:54329 password=secret' };
    const res = await GET();
    expect(res.status).toBe(503);
    const body = await res.text();
    expect(JSON.parse(body)).toEqual({ status: 'degraded', database: { ok: false, error: 'database unreachable' } });
    expect(body).not.toContain('ECONNREFUSED');
  });
});
