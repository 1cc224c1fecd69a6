// Load the demo venues and people. Refuses anything but a local database unless told explicitly.
import { createDb } from '../src/lib/server/db/client';
import { isLocalDatabaseUrl } from '../src/lib/server/db/local';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from '../src/lib/server/demo';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set.');
if (!isLocalDatabaseUrl(url) && process.env.GLOAMING_SEED_ANY_DATABASE !== 'yes') {
	console.error(
		'Refusing to load demo data: DATABASE_URL is not a database on this machine. ' +
			'Set GLOAMING_SEED_ANY_DATABASE=yes if you really mean it.'
	);
	process.exit(1);
}
const { db, sql } = createDb(url, { max: 1 });
await seedDemo(db);
await sql.end();
console.log(`[db] demo data ready (${DEMO_PEOPLE.length} people, password ${DEMO_PASSWORD})`);
