// Apply the committed migrations in drizzle/ to DATABASE_URL.
import { createDb } from '../src/lib/server/db/client';
import { applyMigrations } from '../src/lib/server/migrate';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set.');
const { db, sql } = createDb(url, { max: 1 });
await applyMigrations(db);
await sql.end();
console.log('[db] migrations applied');
