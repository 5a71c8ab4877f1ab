// Types of the parts of bootstrap.mjs that TypeScript scripts use (tests/bench/upload.ts).
export const root: string;
export function bin(name: string): string;
export function ensurePostgresInstalled(): string;
export function startPostgres(pgBin: string): Promise<{ startedHere: boolean; psql(sql: string, db?: string): string; stop(): void }>;
export function ensureDatabases(pg: { psql(sql: string, db?: string): string }, databases: string[], opts?: { recreate?: string[] }): string;
export function databaseUrl(password: string, db: string): string;
export function waitForHttp(url: string, timeoutMs?: number): Promise<boolean>;
