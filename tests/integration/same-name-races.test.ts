import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { rooms, scenes } from '../../src/lib/server/db/schema';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// Two saves of the same name at once: the app's own check sees no clash, and the database's unique
// index refuses the second write. That refusal must come back as "already has that name" beside
// the field. The race is made certain: the test holds an uncommitted row with the name, waits
// until the app's insert is blocked behind it, then commits.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const newScene = await import('../../src/routes/(app)/v/[venue]/scenes/new/+page.server');
const roomsPage = await import('../../src/routes/(app)/v/[venue]/rooms/+page.server');

let slug: string;
let venueId: string;
let designer: ReturnType<typeof asSession>;

beforeAll(async () => {
	const d = await makePerson(db, 'Designer');
	const { venue } = await makeVenue(db, [[d.id, 'designer']]);
	slug = venue.slug;
	venueId = venue.id;
	designer = asSession(d);
});

/** Runs `write` while another transaction holds an uncommitted row from `hold`, then commits it. */
async function race<T>(hold: (tx: typeof db) => Promise<unknown>, write: () => Promise<T>) {
	let release!: () => void;
	const released = new Promise<void>((r) => (release = r));
	let held!: () => void;
	const holding = new Promise<void>((r) => (held = r));
	const holder = db.transaction(async (tx) => {
		await hold(tx as never);
		held();
		await released;
	});
	await holding;
	const answer = write();
	// Wait until the app's write is queued behind the held row's lock.
	for (let i = 0; i < 200; i++) {
		const [{ n }] = await db.execute<{ n: number }>(
			sql`select count(*)::int as n from pg_locks where not granted`
		);
		if (n > 0) break;
		await new Promise((r) => setTimeout(r, 10));
	}
	release();
	await holder;
	return answer;
}

describe('same-name races', () => {
	it('a new scene racing another of the same name says the name is taken', async () => {
		const answer = await race(
			(tx) => tx.insert(scenes).values({ venueId, name: 'Crypt walk', lengthMs: 1000 }),
			() =>
				callAction(newScene.actions.default as never, {
					path: `/v/${slug}/scenes/new`,
					params: { venue: slug },
					person: designer,
					form: { name: 'Crypt walk', trigger: 'manual', lengthS: '5', rearmS: '0' }
				})
		);
		expect(answer.status).toBe(400);
		expect(answer.body).toMatchObject({
			errors: { name: ['A scene of this venue already has that name.'] }
		});
		const stored = await db.select().from(scenes).where(eq(scenes.venueId, venueId));
		expect(stored).toHaveLength(1);
	});

	it('a new room racing another of the same name says the room exists', async () => {
		const answer = await race(
			(tx) => tx.insert(rooms).values({ venueId, name: 'Boiler room', position: 99 }),
			() =>
				callAction(roomsPage.actions.add as never, {
					path: `/v/${slug}/rooms?/add`,
					params: { venue: slug },
					person: designer,
					form: { name: 'Boiler room' }
				})
		);
		expect(answer.status).toBe(400);
		expect(answer.body).toMatchObject({
			errors: { name: ['This venue already has a room with that name.'] }
		});
	});
});
