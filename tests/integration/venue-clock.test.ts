import { describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { memberships, venues } from '../../src/lib/server/db/schema';
import { buildShowRunSheets } from '../../src/lib/server/runsheets/build';
import { feedCalendar, resetFeed } from '../../src/lib/server/schedule/feeds';
import { renderRunSheet } from '../../emails/run-sheet';
import { makePerson, testDb } from './db';
import { makeNight } from './night';
import { asSession, callAction, eventFor, answerOf, useTestEnv } from './routes';

vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const settings = await import('../../src/routes/(app)/v/[venue]/settings/+page.server');
const tonight = await import('../../src/routes/(app)/v/[venue]/+page.server');
const origin = 'https://gloaming.example';

async function setup() {
	const n = await makeNight(db);
	const owner = await makePerson(db, 'Olu Owner');
	await db.insert(memberships).values({ venueId: n.venue.id, personId: owner.id, role: 'owner' });
	const save = (person: { id: string; name: string | null; email: string }, clock: string) =>
		callAction(settings.actions.save as never, {
			path: `/v/${n.venue.slug}/settings`,
			params: { venue: n.venue.slug },
			person: asSession(person),
			form: {
				name: n.venue.name,
				kind: 'haunt',
				timeZone: 'Europe/London',
				clock,
				defaultGroupSize: '6',
				dispatchIntervalSeconds: '90',
				runSheetLeadHours: '24'
			}
		});
	const clockNow = async () =>
		(await db.select({ c: venues.clock }).from(venues).where(eq(venues.id, n.venue.id)))[0].c;
	const tonightAs = async (person: { id: string; name: string | null; email: string }) => {
		const event = await eventFor({
			path: `/v/${n.venue.slug}`,
			params: { venue: n.venue.slug },
			person: asSession(person)
		});
		return (await answerOf(() => tonight.load(event as never))).body as {
			next: {
				crewCall: string;
				doorsOpen: string;
				doorsClose: string;
				myCalls: { call: string }[];
			};
		};
	};
	return { n, owner, save, clockNow, tonightAs };
}

describe('the venue clock', () => {
	it('is 24-hour until the owner switches it, then pages, run sheets and ICS use 12-hour words', async () => {
		const { n, owner, save, clockNow, tonightAs } = await setup();
		expect(await clockNow()).toBe('24h');
		// Shows of makeNight: crew call 16:00 UTC, doors 18:00–22:00 UTC on 1 October 2027, which
		// is British Summer Time (UTC+1) in Europe/London.
		const before = await tonightAs(n.crewHere);
		expect(before.next.crewCall).toBe('17:00');
		expect(before.next.doorsOpen).toBe('19:00');

		expect((await save(owner, '12h')).status).toBe(200);
		expect(await clockNow()).toBe('12h');

		const page = await tonightAs(n.crewHere);
		expect(page.next.crewCall).toBe('5:00 pm');
		expect(page.next.doorsOpen).toBe('7:00 pm');
		expect(page.next.doorsClose).toBe('11:00 pm');
		expect(page.next.myCalls.map((c) => c.call)).toEqual(['5:00 pm']);

		const built = (await buildShowRunSheets(db, n.venue.id, n.show.id, origin))!;
		const sheet = built.sheets.find((s) => s.personId === n.crewHere.id)!;
		const { text, html } = renderRunSheet(sheet.data);
		expect(text).toContain('5:00 pm');
		expect(text).toContain('7:00 pm–11:00 pm');
		expect(text).not.toContain('19:00');
		expect(html).toContain('7:00 pm');

		const token = await resetFeed(db, n.crewHere.id, 'person');
		const ics = (await feedCalendar(db, token, origin))!.replace(/\r\n /g, '');
		expect(ics).toContain('crew call 5:00 pm\\, doors 7:00 pm–11:00 pm (London time)');

		expect((await save(owner, '24h')).status).toBe(200);
		expect((await tonightAs(n.crewHere)).next.crewCall).toBe('17:00');
		const back = (await feedCalendar(db, token, origin))!.replace(/\r\n /g, '');
		expect(back).toContain('crew call 17:00\\, doors 19:00–23:00 (London time)');
	});

	it('can be changed by the owner only, and a value that is not a clock is refused with a message', async () => {
		const { n, owner, save, clockNow } = await setup();
		expect((await save(n.crewHere, '12h')).status).toBe(403);
		expect((await save(n.manager, '12h')).status).toBe(403);
		expect(await clockNow()).toBe('24h');

		const bad = await save(owner, '13h');
		expect(bad.status).toBe(400);
		const errors = (bad.body as { errors: Record<string, string[]> }).errors;
		expect(errors.clock).toEqual(['Choose how times are written: 24-hour or 12-hour.']);
		expect(await clockNow()).toBe('24h');
	});
});
