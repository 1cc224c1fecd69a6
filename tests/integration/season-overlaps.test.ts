import { beforeAll, describe, expect, it, vi } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { seasons, shows } from '../../src/lib/server/db/schema';
import {
	createSeason,
	overlappingNights,
	previewNights
} from '../../src/lib/server/schedule/seasons';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// A season saved on top of another: the preview names the nights that clash, saving asks first,
// and a tick keeps both. Dark, cancelled and the season's own nights never clash.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page = await import('../../src/routes/(app)/v/[venue]/seasons/new/+page.server');

// Saturdays in October 2027 from 20:00: on top of the autumn season's Saturday nights (19:00–23:00).
const lateSaturdays = {
	name: 'Late Saturdays',
	firstNight: '2027-10-01',
	ruleMode: 'simple',
	nights: 'SA',
	everyNWeeks: '1',
	endMode: 'until',
	until: '2027-10-31',
	doorsOpen: '20:00',
	doorsClose: '23:30',
	crewCallMinutesBefore: '60',
	darkNights: '',
	extraNights: '',
	openingNight: ''
};
// autumn runs Fridays and Saturdays with 16 October dark.
const CLASHING = ['2027-10-02', '2027-10-09', '2027-10-23', '2027-10-30'];

let manager: ReturnType<typeof asSession>;
let slug: string;
let venueId: string;
let timeZone: string;

beforeAll(async () => {
	const m = await makePerson(db, 'Odile Fenwick');
	const { venue } = await makeVenue(db, [[m.id, 'show_manager']]);
	await createSeason(db, venue.id, venue.timeZone, autumn);
	manager = asSession(m);
	slug = venue.slug;
	venueId = venue.id;
	timeZone = venue.timeZone;
});

const at = () => ({ path: `/v/${slug}/seasons/new`, params: { venue: slug }, person: manager });
const seasonCount = async () =>
	(await db.select().from(seasons).where(eq(seasons.venueId, venueId))).length;

describe('a season that overlaps another', () => {
	it('names the clashing nights in the preview, skipping the dark night', async () => {
		const res = await callAction(page.actions.preview as never, { ...at(), form: lateSaturdays });
		expect(res.status).toBe(200);
		const overlaps = (res.body!.preview as { overlaps: { date: string; seasonName: string }[] })
			.overlaps;
		expect(overlaps).toEqual(CLASHING.map((date) => ({ date, seasonName: 'Autumn 2027' })));
	});

	it('asks before saving, and saves nothing until asked', async () => {
		const res = await callAction(page.actions.save as never, { ...at(), form: lateSaturdays });
		expect(res.status).toBe(400);
		expect((res.body!.errors as Record<string, string[]>).confirmOverlap[0]).toMatch(
			/^4 nights of this season fall on another show's doors/
		);
		expect(await seasonCount()).toBe(1);
	});

	it('does not clash with a cancelled night, nor with doors that only meet end to start', async () => {
		await db
			.update(shows)
			.set({ status: 'cancelled' })
			.where(and(eq(shows.venueId, venueId), eq(shows.date, '2027-10-30')));
		const early = previewNights(
			{
				...autumn,
				name: 'Twilight',
				rule: 'FREQ=WEEKLY;BYDAY=SA;UNTIL=20271031',
				doorsOpen: '17:00',
				doorsClose: '19:00',
				darkNights: []
			},
			timeZone
		);
		// Doors 17:00–19:00 end as the autumn doors open: no clash on any night.
		expect(await overlappingNights(db, venueId, early)).toEqual([]);
		const late = previewNights({ ...autumn, doorsOpen: '22:00', doorsClose: '23:59' }, timeZone);
		const found = await overlappingNights(db, venueId, late);
		expect(found.map((o) => o.date)).not.toContain('2027-10-30');
		expect(found.map((o) => o.date)).toContain('2027-10-01');
	});

	it('saves both when the planner ticks to keep them', async () => {
		const res = await callAction(page.actions.save as never, {
			...at(),
			form: { ...lateSaturdays, confirmOverlap: 'on' }
		});
		expect(res.status).toBe(303);
		expect(await seasonCount()).toBe(2);
	});
});
