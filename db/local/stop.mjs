// `npm run db:stop`: stops the project's PostgreSQL, e.g. after `npm start` was killed hard.
import { ensurePostgresInstalled, stopPostgres } from './bootstrap.mjs';

stopPostgres(ensurePostgresInstalled());
