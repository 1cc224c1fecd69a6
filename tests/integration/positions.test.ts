import { beforeAll, describe, expect, it, vi } from 'vitest';
import { and, eq } from 'drizzle-orm';
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
const showPage = await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/+page.server');

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

	it('moves one assignment to another post with its own call, in place', async () => {
		const [night] = await db.select().from(assignments).where(eq(assignments.personId, crewIds[0]));
		const [queue] = await db
			.select()
			.from(positions)
			.where(and(eq(positions.venueId, venueId), eq(positions.name, 'Queue line')));
		const there = {
			path: `/v/${slug}/shows/${night.showId}`,
			params: { venue: slug, show: night.showId },
			person: manager
		};
		const move = (form: Record<string, string>) =>
			callAction(showPage.actions.reassign as never, { ...there, form });
		const res = await move({ id: night.id, positionId: queue.id, call: '17:45' });
		expect(res.status).toBe(200);
		const [row] = await db.select().from(assignments).where(eq(assignments.id, night.id));
		expect(row.positionId).toBe(queue.id);
		// 17:45 on 1 October 2027 in London is 16:45 UTC (BST, UTC+1).
		expect(row.callOverride?.toISOString()).toBe('2027-10-01T16:45:00.000Z');

		const late = await move({ id: night.id, positionId: queue.id, call: '23:30' });
		expect(late.status).toBe(400);
		expect((late.body!.errors as Record<string, string[]>).call[0]).toBe(
			'The call must be before doors close.'
		);
		const gone = await move({
			id: '00000000-0000-4000-8000-000000000000',
			positionId: queue.id,
			call: ''
		});
		expect(gone.status).toBe(404);
		const [kept] = await db.select().from(assignments).where(eq(assignments.id, night.id));
		expect(kept.callOverride?.toISOString()).toBe('2027-10-01T16:45:00.000Z');
	});
});
