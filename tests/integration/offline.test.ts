import { describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { assignments, checkPhotos, positions, shows } from '../../src/lib/server/db/schema';
import { keepListFor } from '../../src/lib/server/checklists/offline';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callHandler, useTestEnv } from './routes';
import { PNG_1x1 } from './uploads';

// What a crew phone keeps for use without signal, and photos sent twice stored once.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const photosApi = await import('../../src/routes/api/v/[venue]/shows/[show=uuid]/photos/+server');

const HOUR = 3_600_000;
const now = new Date('2027-10-01T12:00:00.000Z');

async function showAt(
	venueId: string,
	callInHours: number,
	extra: Partial<typeof shows.$inferInsert> = {}
) {
	const call = new Date(now.getTime() + callInHours * HOUR);
	const [s] = await db
		.insert(shows)
		.values({
			venueId,
			date: call.toISOString().slice(0, 10),
			crewCall: call,
			doorsOpen: new Date(call.getTime() + 2 * HOUR),
			doorsClose: new Date(call.getTime() + 6 * HOUR),
			...extra
		})
		.returning();
	return s;
}

describe("a phone's list of pages to keep", () => {
	it('lists the checklists of nights the person is called for in the next 36 hours, and only those', async () => {
		const crew = await makePerson(db, 'Crew');
		const other = await makePerson(db, 'Other');
		const { venue } = await makeVenue(db, [
			[crew.id, 'crew'],
			[other.id, 'crew']
		]);
		const { venue: elsewhere } = await makeVenue(db, [[other.id, 'owner']]);
		const [post] = await db
			.insert(positions)
			.values({ venueId: venue.id, name: 'Gate' })
			.returning();
		const assign = async (showId: string, personId = crew.id, callOverride?: Date) =>
			db
				.insert(assignments)
				.values({ venueId: venue.id, showId, positionId: post.id, personId, callOverride });

		const tonight = await showAt(venue.id, 5);
		const tomorrow = await showAt(venue.id, 35);
		const later = await showAt(venue.id, 37);
		// Doors closed an hour ago: the night is over.
		const over = await showAt(venue.id, -7);
		const cancelled = await showAt(venue.id, 10, { status: 'cancelled' });
		const notMine = await showAt(venue.id, 6);
		// Called early by an override: the person's own call counts, not the show's.
		const early = await showAt(venue.id, 40);
		for (const s of [tonight, tomorrow, later, over, cancelled, early])
			await assign(s.id, crew.id, s === early ? new Date(now.getTime() + 30 * HOUR) : undefined);
		await assign(notMine.id, other.id);
		await showAt(elsewhere.id, 2);

		const list = await keepListFor(db, crew.id, now);
		const checklist = (id: string) => `/v/${venue.slug}/shows/${id}/checklist`;
		expect(list.personId).toBe(crew.id);
		expect(list.pages).toEqual([
			'/venues',
			`/v/${venue.slug}`,
			`/v/${venue.slug}/my-nights`,
			checklist(tonight.id),
			checklist(tomorrow.id),
			checklist(early.id)
		]);
		expect(list.data).toEqual(
			[tonight, tomorrow, early].map((s) => `/api/v/${venue.slug}/shows/${s.id}/checks`)
		);
		// Someone else's list holds none of these nights, and names the other venue.
		const theirs = await keepListFor(db, other.id, now);
		expect(theirs.pages).toContain(checklist(notMine.id));
		expect(theirs.pages).toContain(`/v/${elsewhere.slug}`);
		expect(theirs.pages).not.toContain(checklist(tonight.id));
		expect(theirs.pages).not.toContain(`/v/${elsewhere.slug}/my-nights`);
	});
});

describe('a photo sent twice', () => {
	it('is stored once: the second upload with the same id answers with the first photo', async () => {
		const crew = await makePerson(db, 'Crew');
		const other = await makePerson(db, 'Other crew');
		const { venue } = await makeVenue(db, [
			[crew.id, 'crew'],
			[other.id, 'crew']
		]);
		const [post] = await db
			.insert(positions)
			.values({ venueId: venue.id, name: 'Gate' })
			.returning();
		const show = await showAt(venue.id, 2);
		for (const p of [crew, other])
			await db
				.insert(assignments)
				.values({ venueId: venue.id, showId: show.id, positionId: post.id, personId: p.id });
		const clientId = crypto.randomUUID();
		const send = (person: typeof crew, id: string | null = clientId) =>
			callHandler(photosApi.POST as never, {
				path: `/api/v/${venue.slug}/shows/${show.id}/photos?filename=a.png${id ? `&clientId=${id}` : ''}`,
				params: { venue: venue.slug, show: show.id },
				person: asSession(person),
				body: new Uint8Array(PNG_1x1)
			});
		const first = await send(crew);
		expect(first.status).toBe(201);
		const again = await send(crew);
		expect(again).toMatchObject({
			status: 200,
			body: { photoId: first.body!.photoId, replay: true }
		});
		const stored = await db.select().from(checkPhotos).where(eq(checkPhotos.showId, show.id));
		expect(stored).toHaveLength(1);
		expect(stored[0].clientId).toBe(clientId);
		// The same id from someone else is refused, not handed their photo.
		expect(await send(other)).toMatchObject({ status: 409 });
		// An id that is not one is refused in words.
		expect(await send(crew, 'not-an-id')).toMatchObject({
			status: 400,
			body: { message: 'Each photo needs its own id from the phone.' }
		});
		// Without an id every upload is its own photo.
		expect((await send(crew, null)).status).toBe(201);
		expect(await db.select().from(checkPhotos).where(eq(checkPhotos.showId, show.id))).toHaveLength(
			2
		);
	});
});
