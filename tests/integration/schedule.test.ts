import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import ICAL from 'ical.js';
import {
	assignments,
	calendarFeeds,
	positions,
	shows,
	unavailability,
	venues
} from '../../src/lib/server/db/schema';
import { createSeason, seasonShows, updateSeason } from '../../src/lib/server/schedule/seasons';
import { showConflicts } from '../../src/lib/server/schedule/shows';
import { localDay } from '../../src/lib/util/when';
import { feedCalendar, hashFeedToken, resetFeed } from '../../src/lib/server/schedule/feeds';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();

async function londonVenue() {
	const person = await makePerson(db, 'Wren Holloway');
	const made = await makeVenue(db, [[person.id, 'show_manager']]);
	return { person, venue: made.venue };
}

describe('generating a season', () => {
	it('stores one show per night, leaves the dark night out and marks the opening night', async () => {
		const { venue } = await londonVenue();
		const { season, result } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const list = await seasonShows(db, venue.id, season.id);
		// October 2027: Fridays 1, 8, 15, 22, 29 and Saturdays 2, 9, 16, 23, 30, less the 16th.
		expect(list.map((s) => s.date)).toEqual([
			'2027-10-01',
			'2027-10-02',
			'2027-10-08',
			'2027-10-09',
			'2027-10-15',
			'2027-10-22',
			'2027-10-23',
			'2027-10-29',
			'2027-10-30'
		]);
		expect(result.added).toBe(9);
		expect(list.filter((s) => s.openingNight).map((s) => s.date)).toEqual(['2027-10-01']);
	});

	it('keeps doors at 19:00 local on both sides of the clocks going back', async () => {
		const { venue } = await londonVenue();
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const list = await seasonShows(db, venue.id, season.id);
		const byDate = Object.fromEntries(list.map((s) => [s.date, s]));
		// UK summer time ends on the last Sunday of October (31 Oct 2027): BST is UTC+1, GMT is UTC+0.
		expect(byDate['2027-10-30'].doorsOpen.toISOString()).toBe('2027-10-30T18:00:00.000Z');
		expect(byDate['2027-10-29'].crewCall.toISOString()).toBe('2027-10-29T16:00:00.000Z');

		const winter = { ...autumn, firstNight: '2027-10-29', rule: 'FREQ=WEEKLY;BYDAY=FR;COUNT=2' };
		const later = await createSeason(db, venue.id, venue.timeZone, {
			...winter,
			darkNights: [],
			openingNight: null
		});
		const two = await seasonShows(db, venue.id, later.season.id);
		expect(two.map((s) => s.doorsOpen.toISOString())).toEqual([
			'2027-10-29T18:00:00.000Z',
			'2027-11-05T19:00:00.000Z'
		]);
	});

	it('regenerating moves untouched shows and leaves edited shows as they were', async () => {
		const { venue } = await londonVenue();
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const before = await seasonShows(db, venue.id, season.id);
		const edited = before.find((s) => s.date === '2027-10-08')!;
		const cancelled = before.find((s) => s.date === '2027-10-29')!;
		const late = new Date('2027-10-08T19:30:00Z');
		await db.update(shows).set({ doorsOpen: late, edited: true }).where(eq(shows.id, edited.id));
		await db
			.update(shows)
			.set({ status: 'cancelled', edited: true })
			.where(eq(shows.id, cancelled.id));

		// Doors now at 18:30, the 29th is no longer in the rule (Saturdays only).
		const result = await updateSeason(db, venue.id, season.id, venue.timeZone, {
			...autumn,
			rule: 'FREQ=WEEKLY;BYDAY=SA;UNTIL=20271031',
			doorsOpen: '18:30'
		});
		expect(result).not.toBeNull();
		const after = await seasonShows(db, venue.id, season.id);
		const byDate = Object.fromEntries(after.map((s) => [s.date, s]));
		expect(byDate['2027-10-08'].doorsOpen.toISOString()).toBe(late.toISOString());
		expect(byDate['2027-10-29'].status).toBe('cancelled');
		expect(byDate['2027-10-09'].doorsOpen.toISOString()).toBe('2027-10-09T17:30:00.000Z');
		expect(byDate['2027-10-09'].sequence).toBe(1);
		// Unedited Fridays are gone, the 16th stays dark.
		expect(byDate['2027-10-15']).toBeUndefined();
		expect(byDate['2027-10-16']).toBeUndefined();
		expect(after.map((s) => s.date)).toEqual([
			'2027-10-02',
			'2027-10-08',
			'2027-10-09',
			'2027-10-23',
			'2027-10-29',
			'2027-10-30'
		]);
	});

	it('another venue cannot regenerate or change the season', async () => {
		const { venue } = await londonVenue();
		const other = await londonVenue();
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const result = await updateSeason(db, other.venue.id, season.id, 'Europe/London', autumn);
		expect(result).toBeNull();
	});
});

describe('conflicts', () => {
	it('flags unfilled required positions, double bookings across venues and unavailable nights', async () => {
		const { person: manager, venue } = await londonVenue();
		const crew = await makePerson(db, 'Ivo Brackenridge');
		const { venue: elsewhere } = await makeVenue(db, [[crew.id, 'crew']]);
		await db.update(venues).set({ name: 'Sable Quarry Walk' }).where(eq(venues.id, elsewhere.id));
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const [opening] = await seasonShows(db, venue.id, season.id);
		const [queue, safety] = await db
			.insert(positions)
			.values([
				{ venueId: venue.id, name: 'Queue line', required: true },
				{ venueId: venue.id, name: 'Safety lead', required: true }
			])
			.returning();
		await db.insert(assignments).values({
			venueId: venue.id,
			showId: opening.id,
			positionId: queue.id,
			personId: crew.id
		});
		let found = await showConflicts(db, venue.id, opening.id);
		expect(found.map((c) => c.kind)).toEqual(['unfilled']);
		expect(found[0].message).toContain('Safety lead');

		// The same night at the other venue, overlapping the crew call.
		const { season: theirs } = await createSeason(db, elsewhere.id, elsewhere.timeZone, {
			...autumn,
			doorsOpen: '20:00'
		});
		const [theirOpening] = await seasonShows(db, elsewhere.id, theirs.id);
		const [gate] = await db
			.insert(positions)
			.values({ venueId: elsewhere.id, name: 'Gate', required: false })
			.returning();
		await db.insert(assignments).values({
			venueId: elsewhere.id,
			showId: theirOpening.id,
			positionId: gate.id,
			personId: crew.id
		});
		await db
			.insert(unavailability)
			.values({ venueId: venue.id, personId: crew.id, date: opening.date });
		await db.insert(assignments).values({
			venueId: venue.id,
			showId: opening.id,
			positionId: safety.id,
			personId: manager.id
		});
		found = await showConflicts(db, venue.id, opening.id);
		expect(found.map((c) => c.kind).sort()).toEqual(['double_booked', 'unavailable']);
		const clash = found.find((c) => c.kind === 'double_booked')!;
		// The message names the other venue, the other post and the night, but links nowhere:
		// the other venue's show is not this venue's to open.
		expect(clash.message).toBe(
			'Ivo Brackenridge is assigned as Queue line here and also as Gate at Sable Quarry Walk on ' +
				`${localDay(opening.date)} at the same time.`
		);
		expect(clash.href).toBeUndefined();

		// A cancelled show no longer clashes.
		await db.update(shows).set({ status: 'cancelled' }).where(eq(shows.id, theirOpening.id));
		found = await showConflicts(db, venue.id, opening.id);
		expect(found.map((c) => c.kind)).toEqual(['unavailable']);
	});
});

describe('double-bookings in one venue', () => {
	it('name the other show and post, with a link to it', async () => {
		const { venue } = await londonVenue();
		const crew = await makePerson(db, 'Wren Halloway');
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const [opening] = await seasonShows(db, venue.id, season.id);
		// A second, late show the same night, overlapping the first.
		const [late] = await db
			.insert(shows)
			.values({
				venueId: venue.id,
				date: opening.date,
				crewCall: new Date(opening.crewCall.getTime() + 3_600_000),
				doorsOpen: new Date(opening.doorsOpen.getTime() + 3_600_000),
				doorsClose: new Date(opening.doorsClose.getTime() + 3_600_000)
			})
			.returning();
		const [gate, maze] = await db
			.insert(positions)
			.values([
				{ venueId: venue.id, name: 'Gate', required: false },
				{ venueId: venue.id, name: 'Maze runner', required: false }
			])
			.returning();
		await db.insert(assignments).values([
			{ venueId: venue.id, showId: opening.id, positionId: gate.id, personId: crew.id },
			{ venueId: venue.id, showId: late.id, positionId: maze.id, personId: crew.id }
		]);
		const [clash] = await showConflicts(db, venue.id, opening.id);
		expect(clash.kind).toBe('double_booked');
		expect(clash.message).toBe(
			'Wren Halloway is assigned as Gate here and also as Maze runner at the show on ' +
				`${localDay(opening.date)} at the same time.`
		);
		expect(clash.href).toBe(`/v/${venue.slug}/shows/${late.id}`);
	});
});

describe('calendar feeds', () => {
	it('stores only a hash, answers the token, and stops answering after a reset', async () => {
		const { person, venue } = await londonVenue();
		const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
		const [opening] = await seasonShows(db, venue.id, season.id);
		const [post] = await db
			.insert(positions)
			.values({ venueId: venue.id, name: 'Room tech, Mill Race', required: true })
			.returning();
		await db
			.insert(assignments)
			.values({ venueId: venue.id, showId: opening.id, positionId: post.id, personId: person.id });

		const token = await resetFeed(db, person.id, 'person');
		const stored = await db
			.select()
			.from(calendarFeeds)
			.where(eq(calendarFeeds.personId, person.id));
		expect(stored).toHaveLength(1);
		expect(stored[0].tokenHash).toBe(hashFeedToken(token));
		expect(stored[0].tokenHash).not.toContain(token);

		const ics = await feedCalendar(db, token, 'https://gloaming.test');
		expect(ics).not.toBeNull();
		// Read back with a general-purpose RFC 5545 parser.
		const calendar = new ICAL.Component(ICAL.parse(ics!));
		const events = calendar.getAllSubcomponents('vevent').map((v) => new ICAL.Event(v));
		expect(events).toHaveLength(1);
		expect(events[0].summary).toBe('Crew call: Room tech, Mill Race, ' + venue.name);
		expect(events[0].startDate.toJSDate().toISOString()).toBe('2027-10-01T16:00:00.000Z');
		expect(events[0].endDate.toJSDate().toISOString()).toBe('2027-10-01T22:00:00.000Z');
		// RFC 5545 §3.6.1: every VEVENT has a UID and a DTSTAMP in UTC.
		expect(events[0].uid).toMatch(/^call-.+@gloaming\.test$/);
		expect(calendar.getFirstSubcomponent('vevent')!.getFirstPropertyValue('dtstamp')).toBeTruthy();

		const fresh = await resetFeed(db, person.id, 'person');
		expect(await feedCalendar(db, token, 'https://gloaming.test')).toBeNull();
		expect(await feedCalendar(db, fresh, 'https://gloaming.test')).not.toBeNull();
		expect(await feedCalendar(db, 'not a token', 'https://gloaming.test')).toBeNull();
	});

	it('a venue feed lists its shows and stops when its maker leaves the venue', async () => {
		const { person, venue } = await londonVenue();
		await createSeason(db, venue.id, venue.timeZone, autumn);
		const token = await resetFeed(db, person.id, 'venue', venue.id);
		const ics = await feedCalendar(db, token, 'https://gloaming.test');
		const calendar = new ICAL.Component(ICAL.parse(ics!));
		const events = calendar.getAllSubcomponents('vevent').map((v) => new ICAL.Event(v));
		expect(events).toHaveLength(9);
		expect(events[0].summary).toContain('Opening night');
		const { memberships } = await import('../../src/lib/server/db/schema');
		await db
			.delete(memberships)
			.where(and(eq(memberships.venueId, venue.id), eq(memberships.personId, person.id)));
		expect(await feedCalendar(db, token, 'https://gloaming.test')).toBeNull();
	});
});
