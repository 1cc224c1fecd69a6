import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { assignments, positions } from '../../src/lib/server/db/schema';
import { createSeason, seasonShows } from '../../src/lib/server/schedule/seasons';
import { showConflicts } from '../../src/lib/server/schedule/shows';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// Positions changed in place: renamed, given a headcount; a required post short of its headcount
// is a crew problem that says how many it has.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page = await import('../../src/routes/(app)/v/[venue]/positions/+page.server');

let manager: ReturnType<typeof asSession>;
let slug: string;
let venueId: string;
let gateId: string;
let crewIds: string[];

beforeAll(async () => {
	const m = await makePerson(db, 'Tamsin Holloway');
	const a = await makePerson(db, 'Ned Ashgrove');
	const b = await makePerson(db, 'Pell Marchbank');
	const { venue } = await makeVenue(db, [
		[m.id, 'show_manager'],
		[a.id, 'crew'],
		[b.id, 'crew']
	]);
	const [gate] = await db
		.insert(positions)
		.values([
			{ venueId: venue.id, name: 'Gate', required: true },
			{ venueId: venue.id, name: 'Queue line', required: false }
		])
		.returning();
	manager = asSession(m);
	slug = venue.slug;
	venueId = venue.id;
	gateId = gate.id;
	crewIds = [a.id, b.id];
});

const at = () => ({ path: `/v/${slug}/positions`, params: { venue: slug }, person: manager });
const edit = (form: Record<string, string>) =>
	callAction(page.actions.edit as never, { ...at(), form: { id: gateId, ...form } });

describe('changing a position in place', () => {
	it('renames it and sets its headcount, keeping its assignments', async () => {
		const res = await edit({ name: 'Front gate', required: 'on', headcount: '3' });
		expect(res.status).toBe(200);
		const [row] = await db.select().from(positions).where(eq(positions.id, gateId));
		expect(row).toMatchObject({ name: 'Front gate', required: true, headcount: 3, roomId: null });
	});

	it('refuses a name another position has, and a headcount that is not a whole number', async () => {
		const taken = await edit({ name: 'Queue line', headcount: '1' });
		expect(taken.status).toBe(400);
		expect(Object.keys(taken.body!.errors as object)).toContain('name');
		for (const headcount of ['0', '2.5', 'two', '51']) {
			const res = await edit({ name: 'Front gate', required: 'on', headcount });
			expect(res.status).toBe(400);
			expect((res.body!.errors as Record<string, string[]>).headcount[0]).toMatch(/person|people/);
		}
		const [row] = await db.select().from(positions).where(eq(positions.id, gateId));
		expect(row).toMatchObject({ name: 'Front gate', headcount: 3 });
	});

	it('answers 404 for a position that is gone', async () => {
		const res = await callAction(page.actions.edit as never, {
			...at(),
			form: { id: '00000000-0000-4000-8000-000000000000', name: 'Gate' }
		});
		expect(res.status).toBe(404);
	});

	it('counts a required post short of its headcount as a crew problem', async () => {
		const { season } = await createSeason(db, venueId, 'Europe/London', autumn);
		const [night] = await seasonShows(db, venueId, season.id);
		await db
			.insert(assignments)
			.values(
				crewIds.map((personId) => ({ venueId, showId: night.id, positionId: gateId, personId }))
			);
		const short = (await showConflicts(db, venueId, night.id)).filter((c) => c.kind === 'unfilled');
		expect(short.map((c) => c.message)).toEqual(['Front gate needs 3 people and has 2.']);
		await edit({ name: 'Front gate', required: 'on', headcount: '2' });
		const none = (await showConflicts(db, venueId, night.id)).filter((c) => c.kind === 'unfilled');
		expect(none).toEqual([]);
	});
});
