import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import ICAL from 'ical.js';
import {
	assignments,
	mailMessages,
	outputs,
	positions,
	props,
	rooms,
	runSheetSends,
	sceneCues,
	scenes,
	shows,
	standDowns,
	venues
} from '../../src/lib/server/db/schema';
import type { Envelope } from '../../src/lib/server/mail/outbox';
import { startMailQueue, stopMailQueue } from '../../src/lib/server/mail/queue';
import { buildShowRunSheets } from '../../src/lib/server/runsheets/build';
import {
	crewCallUid,
	queueRunSheets,
	runSheetDelivery,
	sweepRunSheets
} from '../../src/lib/server/runsheets/send';
import type { OutputSettings } from '../../src/lib/schemas/output';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();
const origin = 'https://gloaming.example';
const sent: Envelope[] = [];

beforeAll(async () => {
	await startMailQueue({
		connectionString: inject('databaseUrl'),
		db,
		send: async (m) => {
			sent.push(m);
		},
		retryLimit: 2,
		retryDelaySeconds: 1,
		pollingIntervalSeconds: 0.5
	});
});
afterAll(() => stopMailQueue());

async function delivered(showId: string, count: number, timeoutMs = 20_000) {
	const until = Date.now() + timeoutMs;
	for (;;) {
		const rows = await db
			.select()
			.from(mailMessages)
			.where(and(eq(mailMessages.subjectId, showId), eq(mailMessages.kind, 'run_sheet')));
		if ((rows.length >= count && rows.every((r) => r.status !== 'queued')) || Date.now() > until)
			return rows;
		await new Promise((r) => setTimeout(r, 200));
	}
}

function mailTo(email: string) {
	return sent.filter((m) => m.to === email);
}

function icsOf(m: Envelope) {
	const a = m.attachments.find((x) => x.filename.endsWith('.ics'));
	if (!a) throw new Error('no ICS attachment');
	const cal = new ICAL.Component(ICAL.parse(Buffer.from(a.content, 'base64').toString('utf8')));
	ICAL.TimezoneService.register(new ICAL.Timezone(cal.getFirstSubcomponent('vtimezone')!));
	return new ICAL.Event(cal.getFirstSubcomponent('vevent')!);
}

const relay = (relayKind: 'pneumatic' | 'strobe' | 'fog', loadV = 12): OutputSettings => ({
	kind: 'relay',
	relayKind,
	coilV: 5,
	coilOhm: 70,
	loadSupply: loadV > 50 ? 'ac' : 'dc',
	loadV,
	loadCurrentA: 0.5,
	contactRatingA: 5,
	contactRatingV: 250,
	onMs: null,
	minOnMs: null,
	offMs: null,
	minOffMs: null
});
const string: OutputSettings = {
	kind: 'led_string',
	colour: 'amber',
	forwardV: 2.1,
	ledsInSeries: 3,
	strings: 2,
	currentMa: 20,
	supplyV: 12,
	switchDropV: 0.1,
	logicHighV: 5,
	gateThresholdMaxV: 2.5,
	continuousDrainMa: 200
};

/** A venue in New York with two rooms, three crew and a scene per room, on a show at `doors`. */
async function setUp(doors = new Date('2031-10-10T23:00:00Z'), leadHours = 24) {
	const manager = await makePerson(db, 'Wren Hollis');
	const loft = await makePerson(db, 'Ash Loftkeeper');
	const cellar = await makePerson(db, 'Bryn Cellarman');
	const queue = await makePerson(db, 'Cass Queue');
	const { venue } = await makeVenue(db, [
		[manager.id, 'show_manager'],
		[loft.id, 'crew'],
		[cellar.id, 'crew'],
		[queue.id, 'crew']
	]);
	await db
		.update(venues)
		.set({
			timeZone: 'America/New_York',
			address: '1 Crow Lane',
			safetyContactName: 'Ida Vane',
			safetyContactPhone: '+1 555 0100',
			runSheetLeadHours: leadHours
		})
		.where(eq(venues.id, venue.id));
	const [crowLoft, rootCellar] = await db
		.insert(rooms)
		.values([
			{ venueId: venue.id, name: 'Crow Loft', position: 1 },
			{ venueId: venue.id, name: 'Root Cellar', position: 2 }
		])
		.returning();
	const [dropProp, rootProp] = await db
		.insert(props)
		.values([
			{ venueId: venue.id, name: 'Loft drop', roomId: crowLoft.id },
			{ venueId: venue.id, name: 'Root hand', roomId: rootCellar.id }
		])
		.returning();
	const [valve, flash, heater] = await db
		.insert(outputs)
		.values([
			{
				venueId: venue.id,
				propId: dropProp.id,
				kind: 'relay',
				relayKind: 'pneumatic',
				name: 'Drop valve',
				settings: relay('pneumatic'),
				safeState: 'de_energised'
			},
			{
				venueId: venue.id,
				propId: dropProp.id,
				kind: 'led_string',
				name: 'Loft flicker',
				settings: string,
				safeState: 'full'
			},
			{
				venueId: venue.id,
				propId: rootProp.id,
				kind: 'relay',
				relayKind: 'fog',
				name: 'Root fogger',
				settings: relay('fog', 120),
				safeState: 'off'
			}
		])
		.returning();
	const [feathers, roots] = await db
		.insert(scenes)
		.values([
			{ venueId: venue.id, roomId: crowLoft.id, name: 'Feathers fall', lengthMs: 10_000 },
			{ venueId: venue.id, roomId: rootCellar.id, name: 'Breathing roots', lengthMs: 8_000 }
		])
		.returning();
	await db.insert(sceneCues).values([
		{
			venueId: venue.id,
			sceneId: feathers.id,
			outputId: valve.id,
			startMs: 3000,
			action: { type: 'pulse', durationMs: 300 }
		},
		// 8 flashes a second: over the limit of 3 (WCAG 2.3.1), so signage.
		{
			venueId: venue.id,
			sceneId: feathers.id,
			outputId: flash.id,
			startMs: 4000,
			action: { type: 'strobe', rateHz: 8, durationMs: 1500, level: 1 }
		},
		{
			venueId: venue.id,
			sceneId: roots.id,
			outputId: heater.id,
			startMs: 0,
			action: { type: 'pulse', durationMs: 2000 }
		}
	]);
	const [loftTech, cellarTech, queueLine] = await db
		.insert(positions)
		.values([
			{ venueId: venue.id, name: 'Room tech, Crow Loft', roomId: crowLoft.id },
			{ venueId: venue.id, name: 'Room tech, Root Cellar', roomId: rootCellar.id },
			{ venueId: venue.id, name: 'Queue line' }
		])
		.returning();
	const crewCall = new Date(doors.getTime() - 2 * 3_600_000);
	const [show] = await db
		.insert(shows)
		.values({
			venueId: venue.id,
			date: new Intl.DateTimeFormat('en-CA', { timeZone: 'America/New_York' }).format(doors),
			doorsOpen: doors,
			doorsClose: new Date(doors.getTime() + 4 * 3_600_000),
			crewCall,
			sequence: 2
		})
		.returning();
	const ownCall = new Date(crewCall.getTime() - 30 * 60_000);
	const [loftAssignment] = await db
		.insert(assignments)
		.values([
			{
				venueId: venue.id,
				showId: show.id,
				positionId: loftTech.id,
				personId: loft.id,
				callOverride: ownCall
			},
			{ venueId: venue.id, showId: show.id, positionId: cellarTech.id, personId: cellar.id },
			{ venueId: venue.id, showId: show.id, positionId: queueLine.id, personId: queue.id }
		])
		.returning();
	return { venue, show, manager, loft, cellar, queue, ownCall, loftAssignment, dropProp, rootProp };
}

describe('building run sheets from the database', () => {
	it('gives each crew member their call, post, rooms, scenes with cues and safety notes', async () => {
		const t = await setUp();
		await db.insert(standDowns).values({
			venueId: t.venue.id,
			showId: t.show.id,
			propId: t.rootProp.id,
			reason: 'fog fluid pump sticking'
		});
		const built = (await buildShowRunSheets(db, t.venue.id, t.show.id, origin))!;
		expect(built.sheets.map((s) => s.name)).toEqual([
			'Ash Loftkeeper',
			'Bryn Cellarman',
			'Cass Queue'
		]);
		const [loft, cellar, queue] = built.sheets;

		// Own call 30 minutes before the show's 17:00 EDT crew call.
		expect(loft.callAt).toEqual(t.ownCall);
		expect(loft.data).toMatchObject({
			crewCall: '16:30',
			doors: '19:00–23:00',
			timeZone: 'America/New_York',
			position: 'Room tech, Crow Loft',
			rooms: ['Crow Loft'],
			address: '1 Crow Lane'
		});
		expect(loft.data.scenes).toHaveLength(1);
		expect(loft.data.scenes[0]).toMatchObject({
			name: 'Feathers fall',
			room: 'Crow Loft',
			cues: ['0:03 pulse Drop valve for 0.3 s', '0:04 strobe Loft flicker at 8 Hz for 1.5 s']
		});
		expect(loft.data.scenes[0].warnings).toEqual([
			{ kind: 'strobe', note: 'flashes more than 3 times a second' },
			{ kind: 'pneumatics' }
		]);

		expect(cellar.data.crewCall).toBe('17:00');
		expect(cellar.data.scenes[0].name).toBe('Breathing roots');
		expect(cellar.data.scenes[0].warnings).toEqual([
			{ kind: 'fog' },
			{ kind: 'mains' },
			{ kind: 'stood_down', prop: 'Root hand', reason: 'fog fluid pump sticking' }
		]);
		expect(cellar.summary.stoodDown).toEqual(['Root hand']);

		// A post without a room: no scenes, but the same contacts and show-stop steps.
		expect(queue.data.rooms).toEqual([]);
		expect(queue.data.scenes).toEqual([]);
		for (const s of built.sheets) {
			expect(s.data.safetyContacts).toEqual([
				{ name: 'Ida Vane', role: 'Safety contact', phone: '+1 555 0100' },
				{ name: 'Wren Hollis', role: 'Show manager', email: t.manager.email }
			]);
			expect(s.data.showStop.length).toBeGreaterThan(1);
			expect(s.data.url).toBe(
				`${origin}/v/${t.venue.slug}/shows/${t.show.id}/run-sheets/${s.personId}`
			);
		}
	});

	it('is null for a show of another venue', async () => {
		const t = await setUp();
		const other = await makeVenue(db);
		expect(await buildShowRunSheets(db, other.venue.id, t.show.id, origin)).toBeNull();
	});
});

describe('sending run sheets', () => {
	it('queues one message per person with a crew-call ICS, and never the same version twice', async () => {
		const t = await setUp();
		const first = await queueRunSheets(db, {
			venueId: t.venue.id,
			showId: t.show.id,
			reason: 'send',
			origin,
			actorId: t.manager.id
		});
		expect(first).toEqual({ queued: 3, unchanged: 0 });
		const again = await queueRunSheets(db, {
			venueId: t.venue.id,
			showId: t.show.id,
			reason: 'send',
			origin
		});
		expect(again).toEqual({ queued: 0, unchanged: 3 });
		const rows = await delivered(t.show.id, 3);
		expect(rows).toHaveLength(3);
		expect(rows.every((r) => r.status === 'sent')).toBe(true);

		const [mail] = mailTo(t.loft.email);
		expect(mailTo(t.loft.email)).toHaveLength(1);
		expect(mail.subject).toMatch(/^Run sheet for .* 2031 at Test venue-/);
		expect(mail.text).toContain('Crew call: 16:30 (New York time)');
		expect(mail.text).toContain('Position: Room tech, Crow Loft');
		expect(mail.text).toContain('0:03 pulse Drop valve for 0.3 s');
		expect(mail.html).toContain('Feathers fall');
		const event = icsOf(mail);
		expect(event.startDate.toJSDate()).toEqual(t.ownCall);
		expect(event.startDate.zone.tzid).toBe('America/New_York');
		expect(event.uid).toBe(crewCallUid(t.show.id, t.loft.id, origin));
		expect(event.sequence).toBe(2);

		const status = await runSheetDelivery(db, t.venue.id, t.show.id);
		expect(status).toMatchObject({ sent: 3, failed: 0, total: 3 });
	});

	it('sends a changed run sheet only to the people a change affects, once per change', async () => {
		const t = await setUp();
		// Before anything was sent there is nothing to tell.
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toMatchObject({ queued: 0 });
		await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'send', origin });
		await delivered(t.show.id, 3);

		const later = new Date(t.ownCall.getTime() + 15 * 60_000);
		await db
			.update(assignments)
			.set({ callOverride: later })
			.where(eq(assignments.id, t.loftAssignment.id));
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toEqual({ queued: 1, unchanged: 2 });
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toEqual({ queued: 0, unchanged: 3 });
		await delivered(t.show.id, 4);
		const loftMails = mailTo(t.loft.email);
		expect(loftMails).toHaveLength(2);
		expect(loftMails[1].subject).toMatch(/^Changed: Run sheet/);
		expect(loftMails[1].text).toContain('Crew call: 16:45 (was 16:30)');
		const event = icsOf(loftMails[1]);
		expect(event.uid).toBe(crewCallUid(t.show.id, t.loft.id, origin));
		expect(event.sequence).toBe(3);
		expect(event.startDate.toJSDate()).toEqual(later);

		// A prop stood down in the cellar after sending: only the cellar tech hears of it.
		await db.insert(standDowns).values({
			venueId: t.venue.id,
			showId: t.show.id,
			propId: t.rootProp.id,
			reason: 'cracked plate'
		});
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toEqual({ queued: 1, unchanged: 2 });
		await delivered(t.show.id, 5);
		const cellarMails = mailTo(t.cellar.email);
		expect(cellarMails).toHaveLength(2);
		expect(cellarMails[1].text).toContain('Stood down: Root hand (was None)');
		expect(cellarMails[1].text).toContain(
			'Stood down tonight: Root hand, held in safe state (cracked plate)'
		);

		// Taken off the show: a notice, and the calendar event is cancelled.
		await db
			.delete(assignments)
			.where(and(eq(assignments.showId, t.show.id), eq(assignments.personId, t.queue.id)));
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toMatchObject({ queued: 1 });
		await delivered(t.show.id, 6);
		const queueMails = mailTo(t.queue.email);
		expect(queueMails).toHaveLength(2);
		expect(queueMails[1].subject).toMatch(/^Schedule change for/);
		expect(queueMails[1].text).toContain('Position: No longer assigned (was Queue line)');
		expect(icsOf(queueMails[1]).component.getFirstPropertyValue('status')).toBe('CANCELLED');
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toMatchObject({ queued: 0 });

		// Show times moved by hand: everyone still on the show is told, calendars get a higher SEQUENCE.
		await db
			.update(shows)
			.set({ crewCall: new Date(t.show.crewCall.getTime() - 3_600_000), sequence: 3 })
			.where(eq(shows.id, t.show.id));
		expect(
			await queueRunSheets(db, { venueId: t.venue.id, showId: t.show.id, reason: 'change', origin })
		).toMatchObject({ queued: 1 });
		// Only the cellar tech follows the show's call; the loft tech keeps their own call.
		await delivered(t.show.id, 7);
		expect(mailTo(t.cellar.email)[2].text).toContain('Crew call: 16:00 (was 17:00)');
		// Its third revision: SEQUENCE 2, 3, then 4 (it only ever goes up, RFC 5545 §3.8.7.4).
		expect(icsOf(mailTo(t.cellar.email)[2]).sequence).toBe(4);
	});
});

describe('automatic sends before crew call', () => {
	it('picks the shows whose crew call is within the lead time and sends each version once', async () => {
		const now = new Date('2032-03-01T12:00:00Z');
		const hours = (h: number) => new Date(now.getTime() + h * 3_600_000);
		// Doors are 2 h after crew call in setUp.
		const due = await setUp(hours(10 + 2));
		const tooEarly = await setUp(hours(30 + 2));
		const past = await setUp(hours(-1 + 2));
		const longLead = await setUp(hours(40 + 2), 48);
		const off = await setUp(hours(5 + 2), 0);

		const touched = await sweepRunSheets(db, now, origin);
		const ids = (xs: { showId: string }[]) => xs.map((x) => x.showId).sort();
		expect(ids(touched)).toEqual([due.show.id, longLead.show.id].sort());
		expect(touched.every((x) => x.reason === 'auto' && x.queued === 3)).toBe(true);

		// The next sweep finds nothing new to send.
		expect(await sweepRunSheets(db, now, origin)).toEqual([]);
		const sends = await db
			.select()
			.from(runSheetSends)
			.where(
				inArray(runSheetSends.showId, [
					due.show.id,
					tooEarly.show.id,
					past.show.id,
					longLead.show.id,
					off.show.id
				])
			);
		expect(sends.filter((s) => s.showId === due.show.id)).toHaveLength(3);
		expect(sends.filter((s) => s.showId !== due.show.id && s.showId !== longLead.show.id)).toEqual(
			[]
		);
		await delivered(due.show.id, 3);
		expect(mailTo(due.loft.email)).toHaveLength(1);

		// A change after the automatic send goes out with the next sweep, to that person only.
		await db
			.update(assignments)
			.set({ callOverride: hours(9) })
			.where(eq(assignments.id, due.loftAssignment.id));
		expect(await sweepRunSheets(db, now, origin)).toEqual([
			{ showId: due.show.id, reason: 'change', queued: 1 }
		]);
		// Cancelled: those who got a run sheet are told.
		await db.update(shows).set({ status: 'cancelled' }).where(eq(shows.id, due.show.id));
		expect(await sweepRunSheets(db, now, origin)).toEqual([
			{ showId: due.show.id, reason: 'change', queued: 3 }
		]);
		await delivered(due.show.id, 7);
		const notice = mailTo(due.cellar.email).at(-1)!;
		expect(notice.text).toContain('Show: Cancelled (was Scheduled)');
		expect(icsOf(notice).component.getFirstPropertyValue('status')).toBe('CANCELLED');
		expect(await sweepRunSheets(db, now, origin)).toEqual([]);
	});
});
