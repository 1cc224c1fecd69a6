import { afterAll, describe, expect, inject, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import postgres from 'postgres';
import { createDb } from '../../src/lib/server/db/client';
import { memberships, users, venues } from '../../src/lib/server/db/schema';
import { applyMigrations } from '../../src/lib/server/migrate';
import { asSession, callAction, callHandler, useTestEnv } from './routes';

// Who may create a venue needs a fresh install to test, so this file gets a database of its own,
// built from the migrations, and the app's client is pointed at it before the route is loaded.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const shared = new URL(inject('databaseUrl'));
const name = `gloaming_fresh_${randomUUID().slice(0, 8)}`;
const admin = postgres({ ...parts(shared), database: 'postgres', max: 1, onnotice: () => {} });
await admin.unsafe(`create database "${name}"`);
const freshUrl = new URL(shared);
freshUrl.pathname = `/${name}`;
const { db, sql } = createDb(freshUrl.href, { max: 2 });
await applyMigrations(db);
process.env.DATABASE_URL = freshUrl.href;
const page = await import('../../src/routes/(app)/venues/+page.server');
const { closeDb } = await import('../../src/lib/server/db');

afterAll(async () => {
	await sql.end();
	await closeDb();
	await admin.unsafe(`drop database if exists "${name}" with (force)`);
	await admin.end();
});

function parts(url: URL) {
	return {
		host: url.hostname,
		port: Number(url.port),
		username: decodeURIComponent(url.username),
		password: decodeURIComponent(url.password)
	};
}

async function person(label: string) {
	const [p] = await db
		.insert(users)
		.values({ email: `${label}-${randomUUID()}@gloaming.test`, name: label })
		.returning();
	return asSession(p);
}

const create = (who: Awaited<ReturnType<typeof person>>, venueName: string) =>
	callAction(page.actions.create as never, {
		path: '/venues?/create',
		params: {},
		person: who,
		form: { name: venueName, kind: 'haunt', timeZone: 'Europe/London' }
	});

const canCreate = async (who: Awaited<ReturnType<typeof person>>) =>
	(await callHandler(page.load as never, { path: '/venues', params: {}, person: who })).body;

describe('who may create a venue', () => {
	it('on a fresh install the first person may, and only one of two at once becomes first', async () => {
		const a = await person('first');
		const b = await person('also-first');
		expect(await canCreate(a)).toEqual({ canCreate: true, notAllowed: null });
		const [one, two] = await Promise.all([create(a, 'Hollow Barn'), create(b, 'Lantern Walk')]);
		expect([one.status, two.status].sort()).toEqual([303, 403]);
		const all = await db.select().from(venues);
		expect(all).toHaveLength(1);
		const [owner] = await db.select().from(memberships).where(eq(memberships.venueId, all[0].id));
		expect(owner.role).toBe('owner');
		expect([a.id, b.id]).toContain(owner.personId);
	});

	it('after that, people who own no venue are told how to get invited, and nothing is stored', async () => {
		const newcomer = await person('newcomer');
		const seen = await canCreate(newcomer);
		expect(seen!.canCreate).toBe(false);
		expect(seen!.notAllowed).toMatch(/ask its owner to invite you/);
		const res = await create(newcomer, 'Sneaky Venue');
		expect(res.status).toBe(403);
		expect(res.body!.message).toMatch(/^Only owners of a venue can create another one here\./);
		expect(await db.select().from(venues).where(eq(venues.name, 'Sneaky Venue'))).toEqual([]);

		// A crew member of a venue is not an owner either.
		const [existing] = await db.select().from(venues);
		await db
			.insert(memberships)
			.values({ venueId: existing.id, personId: newcomer.id, role: 'crew' });
		expect((await create(newcomer, 'Sneaky Venue')).status).toBe(403);
	});

	it('an owner may create another venue', async () => {
		const [ownership] = await db.select().from(memberships).where(eq(memberships.role, 'owner'));
		const [row] = await db.select().from(users).where(eq(users.id, ownership.personId));
		const res = await create(asSession(row), 'Second Site');
		expect(res.status).toBe(303);
		expect(res.location).toBe('/v/second-site');
	});

	it('GLOAMING_OPEN_VENUES=yes lets anyone create one', async () => {
		const anyone = await person('anyone');
		process.env.GLOAMING_OPEN_VENUES = 'yes';
		try {
			expect((await canCreate(anyone))!.canCreate).toBe(true);
			expect((await create(anyone, 'Open Trail')).status).toBe(303);
		} finally {
			delete process.env.GLOAMING_OPEN_VENUES;
		}
		expect((await create(await person('later'), 'Closed Again')).status).toBe(403);
	});
});
