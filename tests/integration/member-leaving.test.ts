import { describe, expect, it, vi } from 'vitest';
import { and, eq } from 'drizzle-orm';
import ICAL from 'ical.js';
import {
	assignments,
	mailMessages,
	memberships,
	positions,
	shows
} from '../../src/lib/server/db/schema';
import { storeMail } from '../../src/lib/server/mail/outbox';
import { buildShowRunSheets } from '../../src/lib/server/runsheets/build';
import { resetFeed } from '../../src/lib/server/schedule/feeds';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, callHandler, useTestEnv } from './routes';

// A person removed from a venue, or given a smaller role, stops getting what they may no longer
// see: future nights, run sheets, calendar feeds and queued mail, checked on every request.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const members = await import('../../src/routes/(app)/v/[venue]/members/+page.server');
const mailLog = await import('../../src/routes/(app)/v/[venue]/mail/+page.server');
const feedRoute = await import('../../src/routes/calendar/[token].ics/+server');

const ORIGIN = 'https://gloaming.test';
type Venue = Awaited<ReturnType<typeof makeVenue>>['venue'];

async function night(venue: Venue, date: string, notes: string | null = null) {
	const [show] = await db
		.insert(shows)
		.values({
			venueId: venue.id,
			date,
			doorsOpen: new Date(`${date}T18:00:00Z`),
			doorsClose: new Date(`${date}T22:00:00Z`),
			crewCall: new Date(`${date}T16:00:00Z`),
			notes
		})
		.returning();
	return show;
}

async function assign(venue: Venue, showId: string, personId: string, post = 'Queue line') {
	let [p] = await db
		.select()
		.from(positions)
		.where(and(eq(positions.venueId, venue.id), eq(positions.name, post)));
	if (!p) [p] = await db.insert(positions).values({ venueId: venue.id, name: post }).returning();
	await db.insert(assignments).values({ venueId: venue.id, showId, positionId: p.id, personId });
}

/** The summaries of a feed's events, or its status when it does not answer with a calendar. */
async function feed(token: string) {
	const res = await callHandler(feedRoute.GET as never, {
		path: `/calendar/${token}.ics`,
		params: { token },
		person: null
	});
	if (res.status !== 200) return { status: res.status, events: [] as ICAL.Event[] };
	const cal = new ICAL.Component(ICAL.parse(String(res.body!.text)));
	return {
		status: 200,
		events: cal.getAllSubcomponents('vevent').map((v) => new ICAL.Event(v))
	};
}

const assignedShows = async (venueId: string, personId: string) =>
	(
		await db
			.select({ date: shows.date })
			.from(assignments)
			.innerJoin(shows, eq(shows.id, assignments.showId))
			.where(and(eq(assignments.venueId, venueId), eq(assignments.personId, personId)))
	)
		.map((r) => r.date)
		.sort();

const queuedTo = (venueId: string, recipient: string, subjectId: string) =>
	storeMail(db, {
		venueId,
		kind: 'run_sheet',
		subjectId,
		recipient,
		subject: 'Run sheet',
		html: '<p>Show stop: press the red button.</p>',
		text: 'Show stop: press the red button.'
	}).then((r) => r.message.id);

const statusOf = async (id: string) =>
	(await db.select().from(mailMessages).where(eq(mailMessages.id, id)))[0].status;

async function stage() {
	const owner = await makePerson(db, 'Odile Fenwick');
	const crew = await makePerson(db, 'Ivo Brackenridge');
	const {
		venue,
		memberships: [, crewMembership]
	} = await makeVenue(db, [
		[owner.id, 'owner'],
		[crew.id, 'crew']
	]);
	const past = await night(venue, '2020-10-30');
	const future = await night(venue, '2030-10-31');
	await assign(venue, past.id, crew.id);
	await assign(venue, future.id, crew.id);
	const at = {
		path: `/v/${venue.slug}/members`,
		params: { venue: venue.slug },
		person: asSession(owner)
	};
	return { owner, crew, venue, crewMembership, past, future, at };
}

describe('a person removed from a venue', () => {
	it('loses the future nights, run sheets, queued mail and feed of that venue only', async () => {
		const { crew, venue, crewMembership, past, future, at } = await stage();
		// The same person crews another venue too.
		const { venue: other } = await makeVenue(db, [[crew.id, 'crew']]);
		const otherNight = await night(other, '2030-11-01');
		await assign(other, otherNight.id, crew.id);
		const token = await resetFeed(db, crew.id, 'person');
		const here = await queuedTo(venue.id, crew.email.toUpperCase(), future.id);
		const there = await queuedTo(other.id, crew.email, otherNight.id);
		expect((await feed(token)).events).toHaveLength(3);

		const res = await callAction(members.actions.remove as never, {
			...at,
			form: { id: crewMembership.id }
		});
		expect(res).toMatchObject({ status: 200, body: { action: 'remove', saved: true } });
		// The past night stays on record; the future one is ended.
		expect(await assignedShows(venue.id, crew.id)).toEqual([past.date]);
		expect(await statusOf(here)).toBe('withdrawn');
		expect(await statusOf(there)).toBe('queued');

		// Notes written after the removal do not reach them through their own feed.
		await db.update(shows).set({ notes: 'Gate code 4471' }).where(eq(shows.id, future.id));
		const after = await feed(token);
		expect(after.status).toBe(200);
		expect(after.events.map((e) => e.summary)).toEqual([`Crew call: Queue line, ${other.name}`]);
		expect(after.events.map((e) => e.description).join()).not.toContain('4471');

		// An assignment left behind (by older code, or a race) gives them no run sheet either.
		await assign(venue, future.id, crew.id, 'Room tech');
		const built = await buildShowRunSheets(db, venue.id, future.id, ORIGIN);
		expect(built!.sheets.map((s) => s.personId)).not.toContain(crew.id);
		const feedAgain = await feed(token);
		expect(feedAgain.events).toHaveLength(1);

		// Nor can the mail log send the withdrawn message to them again.
		const resend = await callAction(mailLog.actions.resend as never, {
			...at,
			path: `/v/${venue.slug}/mail`,
			form: { id: here }
		});
		expect(resend).toMatchObject({
			status: 400,
			body: {
				message: `${crew.email.toUpperCase()} no longer belongs to this venue, so the message was not sent again.`
			}
		});
	});

	it('their feed stops answering once they belong to no venue', async () => {
		const { crew, crewMembership, at } = await stage();
		const token = await resetFeed(db, crew.id, 'person');
		expect((await feed(token)).status).toBe(200);
		await callAction(members.actions.remove as never, { ...at, form: { id: crewMembership.id } });
		expect((await feed(token)).status).toBe(404);
	});
});

describe('a person given a smaller role', () => {
	it('gets from their venue feed only what the new role may see, and then nothing once removed', async () => {
		const { owner, venue, future, at } = await stage();
		const manager = await makePerson(db, 'Wren Holloway');
		const [m] = await db
			.insert(memberships)
			.values({ venueId: venue.id, personId: manager.id, role: 'show_manager' })
			.returning();
		const theirs = await night(venue, '2030-11-07', 'Fog test at six');
		await assign(venue, theirs.id, manager.id);
		const token = await resetFeed(db, manager.id, 'venue', venue.id);
		const mail = await queuedTo(venue.id, manager.email, future.id);
		expect((await feed(token)).events.map((e) => e.startDate.toString().slice(0, 10))).toEqual([
			'2020-10-30',
			'2030-10-31',
			'2030-11-07'
		]);

		const res = await callAction(members.actions.role as never, {
			...at,
			form: { id: m.id, role: 'crew' }
		});
		expect(res).toMatchObject({ status: 200, body: { action: 'role', saved: true } });
		// As crew the venue feed shows their own nights only; the demotion ended future ones.
		expect(await assignedShows(venue.id, manager.id)).toEqual([]);
		expect((await feed(token)).events).toHaveLength(0);
		expect(await statusOf(mail)).toBe('withdrawn');
		await assign(venue, theirs.id, manager.id);
		expect((await feed(token)).events.map((e) => e.summary)).toEqual([`Show: ${venue.name}`]);

		await callAction(members.actions.remove as never, { ...at, form: { id: m.id } });
		expect((await feed(token)).status).toBe(404);
		expect(owner.id).toBeTruthy();
	});

	it('a promotion keeps their nights', async () => {
		const { crew, venue, crewMembership, past, future, at } = await stage();
		await callAction(members.actions.role as never, {
			...at,
			form: { id: crewMembership.id, role: 'show_manager' }
		});
		expect(await assignedShows(venue.id, crew.id)).toEqual([past.date, future.date]);
	});
});
