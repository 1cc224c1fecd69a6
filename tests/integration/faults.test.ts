import { describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { faultEvents, faults, memberships } from '../../src/lib/server/db/schema';
import { recordResult } from '../../src/lib/server/checklists/record';
import { loadChecklist } from '../../src/lib/server/checklists/state';
import { syncChecklist } from '../../src/lib/server/checklists/sync';
import { listFaults } from '../../src/lib/server/faults/records';
import { downtimeMinutes, durationWords } from '../../src/lib/faults/downtime';
import { makePerson, testDb } from './db';
import { makeNight } from './night';
import { asSession, callAction, useTestEnv } from './routes';

vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page = await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/faults/+page.server');

async function setup() {
	const n = await makeNight(db);
	const designer = await makePerson(db, 'Dee Signer');
	await db
		.insert(memberships)
		.values({ venueId: n.venue.id, personId: designer.id, role: 'designer' });
	await syncChecklist(db, n.venue.id, n.show.id);
	const list = await loadChecklist(db, n.ctx('show_manager'), n.show.id);
	const check = list.checks.find((c) => c.propId && c.expected.mode !== 'reading')!;
	const act = (
		name: 'report' | 'repair' | 'retest' | 'close',
		person: { id: string; name: string | null; email: string },
		propId: string,
		form: Record<string, string>,
		slug = n.venue.slug
	) =>
		callAction(page.actions[name] as never, {
			path: `/v/${slug}/props/${propId}/faults`,
			params: { venue: slug, prop: propId },
			person: asSession(person),
			form
		});
	const result = (outcome: 'pass' | 'fail') =>
		recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: check.id, outcome }
		});
	return { n, designer, check, act, result };
}

const idOf = (location: string | undefined) => location?.split('#fault-')[1] ?? '';

describe('faults on props', () => {
	it('goes from a failed check through a repair and a passing re-test to closed', async () => {
		const { n, designer, check, act, result } = await setup();
		expect((await result('fail')).ok).toBe(true);
		const propId = check.propId!;

		const empty = await act('report', n.crewHere, propId, { seen: ' ' });
		expect(empty.status).toBe(400);
		expect(empty.body).toMatchObject({
			errors: { seen: [expect.stringContaining('what you saw')] }
		});

		const reported = await act('report', n.crewHere, propId, {
			seen: 'Lid jams half open',
			severity: 'stops_scene',
			checkId: check.id,
			showId: n.show.id
		});
		expect(reported.status).toBe(303);
		const faultId = idOf(reported.location);
		const [row] = await db.select().from(faults).where(eq(faults.id, faultId));
		expect(row).toMatchObject({ checkId: check.id, showId: n.show.id, severity: 'stops_scene' });
		// The room defaults to the prop's.
		expect(row.roomId).not.toBeNull();

		// Crew cannot record a repair, and nothing is stored when they try.
		const byCrew = await act('repair', n.crewHere, propId, {
			faultId,
			action: 'Freed the hinge',
			minutes: '20'
		});
		expect(byCrew.status).toBe(403);
		// Closing before any repair or re-test is refused.
		const early = await act('close', n.manager, propId, { faultId });
		expect(early.status).toBe(400);
		expect(early.body).toMatchObject({
			errors: { faultId: [expect.stringContaining('no repair')] }
		});

		const badMinutes = await act('repair', designer, propId, {
			faultId,
			action: 'Freed the hinge',
			minutes: 'soon'
		});
		expect(badMinutes.body).toMatchObject({ values: { action: 'Freed the hinge' } });
		const repaired = await act('repair', designer, propId, {
			faultId,
			action: 'Freed the hinge',
			parts: 'One hinge pin',
			minutes: '20'
		});
		expect(repaired.status).toBe(303);

		// Repaired but not yet re-tested: closing is refused.
		const notYet = await act('close', n.manager, propId, { faultId });
		expect(notYet.status).toBe(400);
		expect(notYet.body).toMatchObject({
			errors: { faultId: [expect.stringContaining('passing re-test after the repair')] }
		});
		// A failing check after the repair does not count either.
		await result('fail');
		expect((await act('close', n.manager, propId, { faultId })).status).toBe(400);

		// The next passing result of the prop's check is linked as the re-test; then it closes.
		await result('pass');
		expect((await listFaults(db, n.venue.id, { openOnly: true })).map((f) => f.id)).toContain(
			faultId
		);
		const closed = await act('close', n.manager, propId, { faultId, note: 'Ran clean' });
		expect(closed.status).toBe(303);
		const events = await db
			.select()
			.from(faultEvents)
			.where(eq(faultEvents.faultId, faultId))
			.orderBy(faultEvents.at);
		expect(events.map((e) => e.kind)).toEqual(['reported', 'repaired', 'retested', 'closed']);
		expect(events[2].checkResultId).not.toBeNull();
		expect(events[2].passed).toBe(true);
		const [view] = await listFaults(db, n.venue.id, { propId });
		expect(view.state).toBe('closed');
		expect(await listFaults(db, n.venue.id, { openOnly: true })).toEqual([]);
		// Closed twice is refused.
		expect((await act('close', n.manager, propId, { faultId })).status).toBe(400);

		// History stays as written.
		await expect(
			db.execute(sql`update faults set seen = 'edited' where id = ${faultId}`)
		).rejects.toMatchObject({
			cause: { message: expect.stringMatching(/append-only/) }
		});
		await expect(
			db.execute(sql`delete from fault_events where fault_id = ${faultId}`)
		).rejects.toMatchObject({
			cause: { message: expect.stringMatching(/append-only|kept for good/) }
		});
	});

	it('closes after a re-test recorded on the fault, and a failed re-test sends it back', async () => {
		const { n, designer, check, act } = await setup();
		const propId = check.propId!;
		const faultId = idOf(
			(await act('report', n.crewHere, propId, { seen: 'Scratched paint', severity: 'cosmetic' }))
				.location
		);
		await act('repair', designer, propId, { faultId, action: 'Touched up', minutes: '5' });
		await act('retest', n.crewHere, propId, { faultId, outcome: 'fail' });
		expect((await listFaults(db, n.venue.id, { propId }))[0].state).toBe('open');
		await act('repair', designer, propId, { faultId, action: 'Second coat', minutes: '5' });
		await act('retest', n.crewHere, propId, { faultId, outcome: 'pass' });
		// Crew report and re-test but do not close.
		expect((await act('close', n.crewHere, propId, { faultId })).status).toBe(403);
		expect((await act('close', designer, propId, { faultId })).status).toBe(303);
	});

	it('is not seen or touched from another venue', async () => {
		const { n, check, act } = await setup();
		const other = await setup();
		const propId = check.propId!;
		const faultId = idOf(
			(await act('report', n.crewHere, propId, { seen: 'Fog leak', severity: 'degraded' })).location
		);
		// Another venue's member on this venue's address gets the venue's 404.
		const outsider = await act('report', other.n.manager, propId, {
			seen: 'x x x',
			severity: 'cosmetic'
		});
		expect(outsider.status).toBe(404);
		// And from their own venue, this prop and fault are not theirs.
		const through = await act('close', other.n.manager, propId, { faultId }, other.n.venue.slug);
		expect(through.status).toBe(404);
		expect((await listFaults(db, other.n.venue.id)).map((f) => f.id)).not.toContain(faultId);
	});

	it('counts downtime from report to verified repair', () => {
		// Hand-worked example, common practice, no published source: reported 21:40, re-test passed
		// 23:55 the same night: 2 h 15 min = 135 minutes.
		const reported = new Date('2027-10-01T21:40:00Z');
		const passed = new Date('2027-10-01T23:55:00Z');
		expect(downtimeMinutes(reported, passed, new Date('2027-10-05T00:00:00Z'))).toBe(135);
		expect(durationWords(135)).toBe('2 h 15 min');
		// Still open: counted to now. 21:40 to 22:25 is 45 minutes.
		expect(downtimeMinutes(reported, null, new Date('2027-10-01T22:25:00Z'))).toBe(45);
		expect(durationWords(45)).toBe('45 min');
		// 26 h 30 min rounds to days and hours.
		expect(durationWords(26 * 60 + 30)).toBe('1 d 2 h');
		expect(durationWords(180)).toBe('3 h');
	});
});
