import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { renderRunSheet } from '../../emails/run-sheet';
import {
	assignments,
	memberships,
	positions,
	sceneCues,
	scenes,
	standDowns,
	venues
} from '../../src/lib/server/db/schema';
import { buildShowRunSheets } from '../../src/lib/server/runsheets/build';
import { makePerson, testDb } from './db';
import { makeNight } from './night';

const db = testDb();
const origin = 'https://gloaming.example';

/** The night with a well tech, a safety lead, a pneumatic scene in the Barn and a safety contact. */
async function night() {
	const n = await makeNight(db);
	await db
		.update(venues)
		.set({ safetyContactName: 'Gate office', safetyContactPhone: '+1 (555) 010-4477' })
		.where(eq(venues.id, n.venue.id));
	const di = await makePerson(db, 'Di Well');
	const lee = await makePerson(db, 'Lee Safe');
	await db.insert(memberships).values([
		{ venueId: n.venue.id, personId: di.id, role: 'crew' },
		{ venueId: n.venue.id, personId: lee.id, role: 'crew' }
	]);
	const [wellTech, lead] = await db
		.insert(positions)
		.values([
			{ venueId: n.venue.id, name: 'Well tech', roomId: n.room.id },
			{ venueId: n.venue.id, name: 'Safety lead', safetyPost: true }
		])
		.returning();
	await db.insert(assignments).values([
		{ venueId: n.venue.id, showId: n.show.id, positionId: wellTech.id, personId: di.id },
		{ venueId: n.venue.id, showId: n.show.id, positionId: lead.id, personId: lee.id }
	]);
	const [hiss] = await db
		.insert(scenes)
		.values({
			venueId: n.venue.id,
			roomId: n.barn.id,
			name: 'Hiss',
			trigger: 'timer',
			lengthMs: 3000
		})
		.returning();
	await db.insert(sceneCues).values({
		venueId: n.venue.id,
		sceneId: hiss.id,
		outputId: n.valve.id,
		startMs: 0,
		action: { type: 'pulse', durationMs: 200 }
	});
	return { ...n, di, lee };
}

async function sheetOf(n: Awaited<ReturnType<typeof night>>, personId: string) {
	const built = await buildShowRunSheets(db, n.venue.id, n.show.id, origin);
	return built!.sheets.find((s) => s.personId === personId)!;
}

describe('run sheets for each post', () => {
	it("gives a room post its own room's checks before doors, and a tappable phone number", async () => {
		const n = await night();
		const { data } = await sheetOf(n, n.di.id);
		expect(data.rooms).toEqual(['Well room']);
		expect(data.safetyPost).toBeUndefined();
		// The Well's plate and glow are generated for the Well room (generateChecklist keys).
		expect(data.checklist).toEqual([
			{ room: 'Well room', item: 'Well: Plate sensor test' },
			{ room: 'Well room', item: 'Well: Glow fires and resets' }
		]);
		const mail = renderRunSheet(data);
		expect(mail.html).toContain('Your checks before doors');
		expect(mail.text).toContain('[ ] Well room: Well: Plate sensor test');
		// RFC 3966: the dialled number keeps only digits and the leading plus.
		expect(mail.html).toContain('href="tel:+15550104477"');
		expect(mail.html).not.toContain('Hazards in every room');
	});

	it("gives the safety lead every room's hazards and every safety check, never 'Rooms: None'", async () => {
		const n = await night();
		const { data } = await sheetOf(n, n.lee.id);
		expect(data.safetyPost).toBe(true);
		expect(data.rooms).toEqual(['Well room', 'Barn']);
		expect(data.hazards).toEqual([
			{ room: 'Barn', scene: 'Hiss', warnings: [{ kind: 'pneumatics' }] }
		]);
		const items = data.checklist!.map((c) => c.item);
		// The venue's five starting items, the show-stop test and the drop's pinch guards.
		expect(items).toEqual(
			expect.arrayContaining([
				'Exits lit and clear',
				'Stop buttons tested',
				'Show-stop test: lights come up, audio and effects go off',
				'Drop: pinch points guarded',
				'Drop: air can be bled for maintenance'
			])
		);
		expect(items).not.toContain('Well: Plate sensor test');
		const mail = renderRunSheet(data);
		expect(mail.text).toContain('Rooms: Every room (Well room, Barn)');
		expect(mail.text).not.toContain('Rooms: None');
		expect(mail.text).toContain('! Barn, Hiss: Pneumatics: keep clear of moving parts');

		// A stood-down prop's checks leave the sheet; its scene says it is held safe.
		await db
			.insert(standDowns)
			.values({ venueId: n.venue.id, showId: n.show.id, propId: n.drop.id, reason: 'Leaking' });
		const after = (await sheetOf(n, n.lee.id)).data;
		expect(after.checklist!.map((c) => c.item)).not.toContain('Drop: pinch points guarded');
		expect(after.hazards![0].warnings).toContainEqual({
			kind: 'stood_down',
			prop: 'Drop',
			reason: 'Leaking'
		});
	});
});
