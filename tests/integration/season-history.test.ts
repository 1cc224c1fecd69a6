import { beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { checkResults, checks, seasons, shows, venues } from '../../src/lib/server/db/schema';
import { createSeason, seasonShows } from '../../src/lib/server/schedule/seasons';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// Check history outlives the season it was recorded in: a season with results cannot be removed,
// a season change keeps the nights that have results, and the database refuses the cascade too.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page = await import('../../src/routes/(app)/v/[venue]/seasons/[season=uuid]/+page.server');

// Autumn on Saturdays only: the Fridays leave it.
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

/** A venue with the autumn season and one passing result recorded on the given night. */
async function seasonWithResultOn(date: string) {
	const m = await makePerson(db, 'Wren Holloway');
	manager = asSession(m);
	const { venue } = await makeVenue(db, [[m.id, 'show_manager']]);
	const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
	const night = (await seasonShows(db, venue.id, season.id)).find((s) => s.date === date)!;
	const [check] = await db
		.insert(checks)
		.values({
			venueId: venue.id,
			showId: night.id,
			key: 'safety:exits',
			kind: 'safety',
			label: 'Exits lit and clear',
			expected: { mode: 'walk', why: 'Life safety.' },
			sortKey: '0'
		})
		.returning();
	const [result] = await db
		.insert(checkResults)
		.values({
			venueId: venue.id,
			showId: night.id,
			checkId: check.id,
			personId: m.id,
			outcome: 'pass',
			clientId: randomUUID()
		})
		.returning();
	const at = {
		path: `/v/${venue.slug}/seasons/${season.id}`,
		params: { venue: venue.slug, season: season.id },
		person: manager
	};
	return { venue, season, night, result, at };
}

const resultStored = async (id: string) =>
	(await db.select().from(checkResults).where(eq(checkResults.id, id))).length === 1;

beforeAll(async () => {
	await makePerson(db);
});

describe('a season with recorded check results', () => {
	it('is not removed: the page says why and what to do instead', async () => {
		const { season, result, at } = await seasonWithResultOn('2027-10-02');
		const res = await callAction(page.actions.remove as never, { ...at, form: {} });
		expect(res.status).toBe(400);
		expect(res.body!.message).toBe(
			'Autumn 2027 cannot be removed: checks or incidents were recorded on 1 night (Sat 2 Oct 2027), and that history is kept for good. To end the season early, change its last night; to take a night off the calendar, cancel it on its own page.'
		);
		expect(await db.select().from(seasons).where(eq(seasons.id, season.id))).toHaveLength(1);
		expect(await resultStored(result.id)).toBe(true);
	});

	it('a season without results is still removed', async () => {
		const m = await makePerson(db, 'Ansel Marsh');
		const { venue } = await makeVenue(db, [[m.id, 'show_manager']]);
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const res = await callAction(page.actions.remove as never, {
			path: `/v/${venue.slug}/seasons/${season.id}`,
			params: { venue: venue.slug, season: season.id },
			person: asSession(m),
			form: {}
		});
		expect(res).toMatchObject({ status: 303, location: `/v/${venue.slug}/seasons` });
		expect(await db.select().from(seasons).where(eq(seasons.id, season.id))).toHaveLength(0);
	});

	it('a season change keeps a night that has results, and says so', async () => {
		const { venue, season, night, result, at } = await seasonWithResultOn('2027-10-08');
		const preview = await callAction(page.actions.preview as never, {
			...at,
			form: saturdaysOnly
		});
		const leaving = (preview.body!.preview as { leaving: { date: string; results: number }[] })
			.leaving;
		expect(leaving.find((l) => l.date === '2027-10-08')).toMatchObject({ results: 1 });
		const res = await callAction(page.actions.save as never, {
			...at,
			form: { ...saturdaysOnly, confirmRemoval: FRIDAYS.join(','), removeAssigned: 'on' }
		});
		expect(res.status).toBe(200);
		expect(res.body!.saved).toMatchObject({ removed: 4, stayed: 1, recorded: ['2027-10-08'] });
		const left = (await seasonShows(db, venue.id, season.id)).map((s) => s.date);
		expect(left.filter((d) => FRIDAYS.includes(d))).toEqual(['2027-10-08']);
		expect(left).toContain(night.date);
		expect(await resultStored(result.id)).toBe(true);
	});

	it('the database itself refuses to remove the season or the night under the results', async () => {
		const { venue, season, night, result } = await seasonWithResultOn('2027-10-09');
		await expect(db.delete(seasons).where(eq(seasons.id, season.id))).rejects.toMatchObject({
			cause: { code: '23001' }
		});
		await expect(
			db.delete(shows).where(and(eq(shows.id, night.id), eq(shows.venueId, venue.id)))
		).rejects.toMatchObject({ cause: { code: '23001' } });
		await expect(db.delete(checks).where(eq(checks.showId, night.id))).rejects.toMatchObject({
			cause: { code: '23001' }
		});
		expect(await resultStored(result.id)).toBe(true);
		// The venue itself going takes its history with it.
		await db.delete(venues).where(eq(venues.id, venue.id));
		expect(await resultStored(result.id)).toBe(false);
	});
});
