import { beforeAll, describe, expect, it, vi } from 'vitest';
import { assignments, positions } from '../../src/lib/server/db/schema';
import { createSeason, seasonShows } from '../../src/lib/server/schedule/seasons';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// Saving a season whose rule drops nights: the preview lists them, saving asks first, and nights
// with crew assigned stay unless the manager ticks to remove them too.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page = await import('../../src/routes/(app)/v/[venue]/seasons/[season=uuid]/+page.server');

// The same season on Saturdays only: the five Fridays leave it.
const saturdaysOnly = {
	name: 'Autumn 2027',
	firstNight: '2027-10-01',
	ruleMode: 'simple',
	nights: 'SA',
	everyNWeeks: '1',
	endMode: 'until',
	until: '2027-10-31',
	doorsOpen: '19:00',
	doorsClose: '23:00',
	crewCallMinutesBefore: '120',
	darkNights: '2027-10-16',
	extraNights: '',
	openingNight: '2027-10-02'
};
const FRIDAYS = ['2027-10-01', '2027-10-08', '2027-10-15', '2027-10-22', '2027-10-29'];

let manager: ReturnType<typeof asSession>;
let slug: string;
let seasonId: string;

beforeAll(async () => {
	const m = await makePerson(db, 'Wren Holloway');
	const crew = await makePerson(db, 'Ivo Brackenridge');
	const { venue } = await makeVenue(db, [
		[m.id, 'show_manager'],
		[crew.id, 'crew']
	]);
	const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
	const [post] = await db
		.insert(positions)
		.values({ venueId: venue.id, name: 'Queue line' })
		.returning();
	const the15th = (await seasonShows(db, venue.id, season.id)).find(
		(s) => s.date === '2027-10-15'
	)!;
	await db
		.insert(assignments)
		.values({ venueId: venue.id, showId: the15th.id, positionId: post.id, personId: crew.id });
	manager = asSession(m);
	slug = venue.slug;
	seasonId = season.id;
});

const at = () => ({
	path: `/v/${slug}/seasons/${seasonId}`,
	params: { venue: slug, season: seasonId },
	person: manager
});
const dates = async () => {
	const { venues } = await import('../../src/lib/server/db/schema');
	const { eq } = await import('drizzle-orm');
	const [v] = await db.select().from(venues).where(eq(venues.slug, slug));
	return (await seasonShows(db, v.id, seasonId)).map((s) => s.date);
};

describe('a season change that drops nights', () => {
	it('previews the nights that would go, with their crew', async () => {
		const res = await callAction(page.actions.preview as never, { ...at(), form: saturdaysOnly });
		expect(res.status).toBe(200);
		const leaving = (res.body!.preview as { leaving: { date: string; assignments: number }[] })
			.leaving;
		expect(leaving.map((l) => l.date)).toEqual(FRIDAYS);
		expect(leaving.find((l) => l.date === '2027-10-15')!.assignments).toBe(1);
		expect(leaving.filter((l) => l.assignments === 0)).toHaveLength(4);
	});

	it('asks before removing anything, and changes nothing until asked', async () => {
		const res = await callAction(page.actions.save as never, { ...at(), form: saturdaysOnly });
		expect(res.status).toBe(400);
		expect((res.body!.errors as Record<string, string[]>).confirmRemoval[0]).toMatch(
			/^Saving removes 4 nights that are no longer in the season/
		);
		expect(await dates()).toEqual(expect.arrayContaining(FRIDAYS));
	});

	it('removes the confirmed nights and keeps the one with crew assigned', async () => {
		const res = await callAction(page.actions.save as never, {
			...at(),
			form: { ...saturdaysOnly, confirmRemoval: FRIDAYS.join(',') }
		});
		expect(res.status).toBe(200);
		expect(res.body!.saved).toMatchObject({ removed: 4, stayed: 1 });
		const left = await dates();
		expect(left.filter((d) => FRIDAYS.includes(d))).toEqual(['2027-10-15']);
	});

	it('removes a night with crew assigned only when that box is ticked too', async () => {
		const unticked = await callAction(page.actions.save as never, {
			...at(),
			form: { ...saturdaysOnly, removeAssigned: 'on' }
		});
		expect(unticked.status).toBe(400);
		expect(await dates()).toContain('2027-10-15');
		const res = await callAction(page.actions.save as never, {
			...at(),
			form: { ...saturdaysOnly, confirmRemoval: '2027-10-15', removeAssigned: 'on' }
		});
		expect(res.status).toBe(200);
		expect(res.body!.saved).toMatchObject({ removed: 1, stayed: 0 });
		expect(await dates()).not.toContain('2027-10-15');
	});
});
