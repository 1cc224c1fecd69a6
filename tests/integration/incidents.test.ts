import { describe, expect, it, vi } from 'vitest';
import { parse } from 'csv-parse/sync';
import { and, eq, sql } from 'drizzle-orm';
import {
	auditLog,
	incidentEvents,
	incidents,
	memberships,
	seasons,
	shows
} from '../../src/lib/server/db/schema';
import { recordedNights } from '../../src/lib/server/schedule/seasons';
import { incidentCounts } from '../../src/lib/server/incidents/records';
import { autumn } from './autumn';
import { makePerson, testDb } from './db';
import { makeNight } from './night';
import { asSession, callAction, callHandler, useTestEnv } from './routes';

vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/incidents/+page.server');
const csvRoute =
	await import('../../src/routes/(app)/v/[venue]/seasons/[season=uuid]/incidents.csv/+server');

type Person = { id: string; name: string | null; email: string };

// makeNight's first show: crew call 16:00Z, doors 18:00Z–22:00Z on 2027-10-01; the venue is in
// London, an hour ahead of UTC in October (BST), so locally 17:00 and 19:00–23:00.
const GOOD = {
	kind: 'guest_injury',
	happenedAt: '2027-10-01T20:15',
	whatHappened: 'A guest slipped on the wet step by the well and grazed a knee.',
	whatWasDone: 'Sat them down at the first aid point; mopped the step.',
	firstAid: 'yes',
	firstAidGiven: 'Plaster on the graze',
	stoppedMinutes: '0'
};

async function setup() {
	const n = await makeNight(db);
	const designer = await makePerson(db, 'Dee Signer');
	await db
		.insert(memberships)
		.values({ venueId: n.venue.id, personId: designer.id, role: 'designer' });
	const act = (
		name: 'report' | 'followUp' | 'close',
		person: Person,
		form: Record<string, string>,
		opts: { slug?: string; show?: string } = {}
	) => {
		const slug = opts.slug ?? n.venue.slug;
		const show = opts.show ?? n.show.id;
		return callAction(page.actions[name] as never, {
			path: `/v/${slug}/shows/${show}/incidents`,
			params: { venue: slug, show },
			person: asSession(person),
			form
		});
	};
	const view = (person: Person, show = n.show.id) =>
		callHandler(page.load as never, {
			path: `/v/${n.venue.slug}/shows/${show}/incidents`,
			params: { venue: n.venue.slug, show },
			person: asSession(person)
		});
	return { n, designer, act, view };
}

const idOf = (location: string | undefined) => location?.split('#incident-')[1] ?? '';
const count = async (venueId: string) => ({
	incidents: (await db.select().from(incidents).where(eq(incidents.venueId, venueId))).length,
	events: (await db.select().from(incidentEvents).where(eq(incidentEvents.venueId, venueId))).length
});

describe('incidents on a night', () => {
	it('is reported by crew on the night, followed up and closed by a show manager', async () => {
		const { n, act, view } = await setup();
		const reported = await act('report', n.crewHere, {
			...GOOD,
			roomId: n.room.id,
			followUpBy: n.manager.id
		});
		expect(reported.status).toBe(303);
		const id = idOf(reported.location);
		const [row] = await db.select().from(incidents).where(eq(incidents.id, id));
		// 20:15 in London in October (BST, UTC+1) is 19:15 UTC.
		expect(row.happenedAt.toISOString()).toBe('2027-10-01T19:15:00.000Z');
		expect(row).toMatchObject({
			kind: 'guest_injury',
			firstAid: true,
			firstAidGiven: 'Plaster on the graze',
			stoppedMinutes: 0,
			roomId: n.room.id,
			followUpBy: n.manager.id,
			personId: n.crewHere.id
		});

		// A show stop, no first aid: what was typed about first aid is not kept.
		const stop = await act('report', n.crewHere, {
			...GOOD,
			kind: 'show_stop',
			happenedAt: '2027-10-01T21:00',
			firstAid: 'no',
			firstAidGiven: 'nothing',
			stoppedMinutes: '12'
		});
		expect(stop.status).toBe(303);
		const stopId = idOf(stop.location);
		const [stopRow] = await db.select().from(incidents).where(eq(incidents.id, stopId));
		expect(stopRow).toMatchObject({ firstAid: false, firstAidGiven: null, stoppedMinutes: 12 });

		// Crew who are not the follow-up owner cannot add notes, and cannot close.
		const crewNote = await act('followUp', n.crewHere, { incidentId: id, note: 'Checked in' });
		expect(crewNote.status).toBe(403);
		const crewClose = await act('close', n.crewHere, { incidentId: id, note: 'All done here' });
		expect(crewClose.status).toBe(403);
		expect((await count(n.venue.id)).events).toBe(0);

		const note = await act('followUp', n.manager, {
			incidentId: id,
			note: 'Rang the guest; knee fine.'
		});
		expect(note.status).toBe(303);
		const emptyClose = await act('close', n.manager, { incidentId: id, note: ' ' });
		expect(emptyClose.status).toBe(400);
		expect(emptyClose.body).toMatchObject({
			errors: { note: [expect.stringContaining('closing note')] }
		});
		const closed = await act('close', n.manager, {
			incidentId: id,
			note: 'Step re-treaded with grip tape.'
		});
		expect(closed.status).toBe(303);
		// Closed once: a second close and a late note are refused in words.
		const again = await act('close', n.manager, { incidentId: id, note: 'Closing again' });
		expect(again.status).toBe(400);
		expect(again.body).toMatchObject({ errors: { note: ['That incident is already closed.'] } });
		const late = await act('followUp', n.manager, { incidentId: id, note: 'One more thing' });
		expect(late.status).toBe(400);

		const events = await db
			.select()
			.from(incidentEvents)
			.where(eq(incidentEvents.incidentId, id))
			.orderBy(incidentEvents.at);
		expect(events.map((e) => [e.kind, e.personId])).toEqual([
			['follow_up', n.manager.id],
			['closed', n.manager.id]
		]);

		// The counts the show page, Tonight and the season page give: two reported, one open.
		const counts = await incidentCounts(db, n.venue.id, [n.show.id, n.other.id]);
		expect([...counts.entries()]).toEqual([[n.show.id, { total: 2, open: 1 }]]);

		// The page: open first, then closed; the crew member sees the night they are on.
		const seen = await view(n.crewHere);
		expect(seen.status).toBe(200);
		const list = (seen.body as { incidents: { id: string; closed: boolean }[] }).incidents;
		expect(list.map((i) => [i.id, i.closed])).toEqual([
			[stopId, false],
			[id, true]
		]);
		expect(seen.body).toMatchObject({ canReport: true, canClose: false });
		// The other crew member is not on this night: refused.
		expect((await view(n.crewOther)).status).toBe(403);

		// Each step is a line in Activity.
		const lines = await db
			.select({ action: auditLog.action, detail: auditLog.detail })
			.from(auditLog)
			.where(and(eq(auditLog.venueId, n.venue.id), sql`${auditLog.action} like 'incident.%'`))
			.orderBy(auditLog.at, auditLog.id);
		expect(lines.map((l) => l.action)).toEqual([
			'incident.reported',
			'incident.reported',
			'incident.followed_up',
			'incident.closed'
		]);
		expect(lines[1].detail).toMatchObject({
			show: n.show.id,
			kind: 'show_stop',
			stoppedMinutes: 12
		});
		// A night with incidents is kept by the season's rules.
		const [season] = await db
			.insert(seasons)
			.values({ ...autumn, venueId: n.venue.id })
			.returning();
		await db.update(shows).set({ seasonId: season.id }).where(eq(shows.id, n.show.id));
		expect(await recordedNights(db, n.venue.id, season.id)).toEqual(['2027-10-01']);
	});

	it('lets the follow-up owner add notes, even from off the night, but not close', async () => {
		const { n, designer, act, view } = await setup();
		const id = idOf(
			(await act('report', n.crewHere, { ...GOOD, followUpBy: designer.id })).location
		);
		// The designer is not on the night, but follows this incident up: they see it, and only it.
		await act('report', n.crewHere, { ...GOOD, kind: 'near_miss' });
		const seen = await view(designer);
		expect(seen.status).toBe(200);
		expect((seen.body as { incidents: { id: string }[] }).incidents.map((i) => i.id)).toEqual([id]);
		expect(seen.body).toMatchObject({ canReport: false, canClose: false });
		expect(
			(await act('followUp', designer, { incidentId: id, note: 'Ordered grip tape' })).status
		).toBe(303);
		expect((await act('close', designer, { incidentId: id, note: 'Done with it' })).status).toBe(
			403
		);
		expect((await act('report', designer, GOOD)).status).toBe(403);
	});

	it('refuses bad input in words beside the field, keeps what was typed, stores nothing', async () => {
		const { n, act } = await setup();
		const before = await count(n.venue.id);
		const ask = async (form: Record<string, string>) => {
			const out = await act('report', n.crewHere, form);
			expect(out.status).toBe(400);
			return out.body as { errors: Record<string, string[]>; values: Record<string, string> };
		};
		const empty = await ask({});
		expect(empty.errors).toMatchObject({
			kind: ['Pick what kind of incident it was.'],
			happenedAt: [expect.stringContaining('Give the time it happened')],
			whatHappened: [expect.stringContaining('Say what happened')],
			whatWasDone: [expect.stringContaining('Say what was done')],
			firstAid: ['Say whether first aid was given.']
		});
		const negative = await ask({ ...GOOD, stoppedMinutes: '-5' });
		expect(negative.errors.stoppedMinutes).toEqual([
			'Minutes cannot be below 0: give 0 when the show did not stop.'
		]);
		expect(negative.values.whatHappened).toBe(GOOD.whatHappened);
		expect((await ask({ ...GOOD, stoppedMinutes: '2.5' })).errors.stoppedMinutes).toEqual([
			'How long the show stopped must be a whole number.'
		]);
		expect((await ask({ ...GOOD, happenedAt: 'last night' })).errors.happenedAt).toEqual([
			'Give the day and time it happened, for example 2027-10-01 21:40.'
		]);
		expect((await ask({ ...GOOD, happenedAt: '2027-02-30T20:00' })).errors.happenedAt).toHaveLength(
			1
		);
		// The night runs 17:00–23:00 local; ±12 h is 05:00 on the 1st to 11:00 on the 2nd.
		const early = await ask({ ...GOOD, happenedAt: '2027-10-01T04:59' });
		expect(early.errors.happenedAt).toEqual([
			'That time is not on this night: give a time from Fri 1 Oct 2027, 05:00 to Sat 2 Oct 2027, 11:00.'
		]);
		expect((await ask({ ...GOOD, happenedAt: '2027-10-02T11:01' })).errors.happenedAt).toHaveLength(
			1
		);
		expect((await ask({ ...GOOD, kind: 'stampede' })).errors.kind).toHaveLength(1);
		const stranger = await makePerson(db, 'Not A Member');
		expect((await ask({ ...GOOD, followUpBy: stranger.id })).errors.followUpBy).toEqual([
			'Pick a member of this venue to follow it up.'
		]);
		const other = await makeNight(db);
		expect((await ask({ ...GOOD, roomId: other.room.id })).errors.roomId).toHaveLength(1);
		// Nothing was stored, and the edges of the night are accepted.
		expect(await count(n.venue.id)).toEqual(before);
		expect(
			(await act('report', n.crewHere, { ...GOOD, happenedAt: '2027-10-01T05:00' })).status
		).toBe(303);
		expect(
			(await act('report', n.crewHere, { ...GOOD, happenedAt: '2027-10-02T11:00' })).status
		).toBe(303);
	});

	it('is not seen or touched from another venue', async () => {
		const { n, act, view } = await setup();
		const other = await setup();
		const id = idOf((await act('report', n.crewHere, GOOD)).location);
		// Another venue's manager on this venue's address: the venue's 404.
		const outsider = await view(other.n.manager);
		expect(outsider.status).toBe(404);
		expect((await act('report', other.n.manager, GOOD)).status).toBe(404);
		// Through their own venue, this night is not found, nor is this incident on their night.
		const throughShow = await act(
			'close',
			other.n.manager,
			{ incidentId: id, note: 'Closing it from elsewhere' },
			{ slug: other.n.venue.slug }
		);
		expect(throughShow.status).toBe(404);
		const throughOwnShow = await act(
			'close',
			other.n.manager,
			{ incidentId: id, note: 'Closing it from elsewhere' },
			{ slug: other.n.venue.slug, show: other.n.show.id }
		);
		expect(throughOwnShow.status).toBe(404);
		expect((await count(n.venue.id)).events).toBe(0);
	});

	it('keeps history as written: the trigger refuses UPDATE and DELETE', async () => {
		const { n, act } = await setup();
		const id = idOf((await act('report', n.crewHere, GOOD)).location);
		await act('followUp', n.manager, { incidentId: id, note: 'Called the guest back' });
		await expect(
			db.execute(sql`update incidents set what_happened = 'edited' where id = ${id}`)
		).rejects.toMatchObject({ cause: { message: expect.stringMatching(/append-only/) } });
		await expect(db.execute(sql`delete from incidents where id = ${id}`)).rejects.toMatchObject({
			cause: { message: expect.stringMatching(/append-only/) }
		});
		await expect(
			db.execute(sql`update incident_events set note = 'edited' where incident_id = ${id}`)
		).rejects.toMatchObject({ cause: { message: expect.stringMatching(/append-only/) } });
		await expect(
			db.execute(sql`delete from incident_events where incident_id = ${id}`)
		).rejects.toMatchObject({ cause: { message: expect.stringMatching(/append-only/) } });
		// Removing the night would take the incident with it: refused.
		await expect(db.execute(sql`delete from shows where id = ${n.show.id}`)).rejects.toMatchObject({
			cause: { message: expect.stringMatching(/kept for good/) }
		});
		expect(await count(n.venue.id)).toEqual({ incidents: 1, events: 1 });
	});

	it('exports a season’s incidents as CSV in the venue’s zone, with formulas defused', async () => {
		const { n, act } = await setup();
		const [season] = await db
			.insert(seasons)
			.values({ ...autumn, venueId: n.venue.id })
			.returning();
		await db.update(shows).set({ seasonId: season.id }).where(eq(shows.venueId, n.venue.id));
		const id = idOf(
			(
				await act('report', n.crewHere, {
					...GOOD,
					roomId: n.room.id,
					whatHappened: '=HYPERLINK("http://example.invalid","click")',
					whatWasDone: '+1 extra steward, then @once more',
					followUpBy: n.manager.id
				})
			).location
		);
		await act('report', n.crewHere, {
			...GOOD,
			kind: 'show_stop',
			happenedAt: '2027-10-01T19:30',
			whatHappened: '-fog alarm, all out',
			firstAid: 'no',
			stoppedMinutes: '14'
		});
		await act('followUp', n.manager, { incidentId: id, note: 'Guest called back, fine' });
		await act('close', n.manager, { incidentId: id, note: '@ step fixed' });

		const get = (person: Person, seasonId = season.id, slug = n.venue.slug) =>
			callHandler(csvRoute.GET as never, {
				path: `/v/${slug}/seasons/${seasonId}/incidents.csv`,
				params: { venue: slug, season: seasonId },
				person: asSession(person)
			});
		expect((await get(n.crewHere)).status).toBe(403);
		const { GET } = csvRoute;
		const { eventFor } = await import('./routes');
		const res = (await GET(
			(await eventFor({
				path: `/v/${n.venue.slug}/seasons/${season.id}/incidents.csv`,
				params: { venue: n.venue.slug, season: season.id },
				person: asSession(n.manager)
			})) as never
		)) as Response;
		expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
		expect(res.headers.get('content-disposition')).toContain('Autumn-2027-incidents.csv');
		const rows: string[][] = parse(await res.text());
		expect(rows[0]).toEqual([
			'Night',
			'Time (Europe/London)',
			'Kind',
			'Room',
			'What happened',
			'What was done',
			'First aid',
			'First aid given',
			'Show stopped (minutes)',
			'Reported by',
			'Follow-up owner',
			'Follow-up notes',
			'State',
			'Closed at',
			'Closing note'
		]);
		expect(rows).toHaveLength(3);
		// In the order they happened: the 19:30 show stop, then the 20:15 injury.
		const [stop, injury] = rows.slice(1);
		expect(stop.slice(0, 9)).toEqual([
			'2027-10-01',
			'2027-10-01 19:30',
			'Show stop',
			'',
			"'-fog alarm, all out",
			GOOD.whatWasDone,
			'no',
			'',
			'14'
		]);
		expect(stop[12]).toBe('open');
		expect(injury[1]).toBe('2027-10-01 20:15');
		expect(injury[3]).toBe('Well room');
		expect(injury[4]).toBe('\'=HYPERLINK("http://example.invalid","click")');
		expect(injury[5]).toBe("'+1 extra steward, then @once more");
		expect(injury[9]).toBe('Bo Crew');
		expect(injury[10]).toBe('Ada Manager');
		expect(injury[11]).toMatch(/^\d{4}-\d\d-\d\d \d\d:\d\d Ada Manager: Guest called back, fine$/);
		expect(injury[12]).toBe('closed');
		expect(injury[14]).toBe("'@ step fixed");
		// Another venue's season through this venue, or this season through another: 404.
		const other = await setup();
		expect((await get(other.n.manager)).status).toBe(404);
		expect((await get(other.n.manager, season.id, other.n.venue.slug)).status).toBe(404);
	});
});
