import { describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq, sql } from 'drizzle-orm';
import {
	changeRecords,
	checks,
	memberships,
	outputs,
	sensors,
	shows
} from '../../src/lib/server/db/schema';
import { recordResult } from '../../src/lib/server/checklists/record';
import { loadChecklist } from '../../src/lib/server/checklists/state';
import { signOff } from '../../src/lib/server/checklists/signoff';
import { syncChecklist } from '../../src/lib/server/checklists/sync';
import { makePerson, testDb } from './db';
import { makeNight } from './night';
import { asSession, callAction, useTestEnv } from './routes';

vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const sensorPage =
	await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/+page.server');
const outputPage =
	await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/outputs/[output=uuid]/+page.server');

/** The shared night, with a designer who changes the props. */
async function night() {
	const n = await makeNight(db);
	const designer = await makePerson(db, 'Dee Signer');
	await db
		.insert(memberships)
		.values({ venueId: n.venue.id, personId: designer.id, role: 'designer' });
	return { ...n, designer };
}
type Night = Awaited<ReturnType<typeof night>>;

/** The plate's saved settings as its edit form posts them, with some fields changed. */
function plateForm(n: Night, change: Record<string, string> = {}) {
	return {
		name: 'Plate',
		'settings.kind': 'capacitive',
		'settings.resistanceOhm': '1M',
		'settings.plateAreaCm2': '100',
		'settings.gapMm': '10',
		'settings.strayPf': '10',
		'settings.samplesAveraged': '4',
		'settings.readingNoiseCounts': '2',
		'settings.handFraction': '0.5',
		...Object.fromEntries(
			(['near', 'far', 'hysteresis', 'debounceMs', 'rearmMs'] as const).map((k) => [
				`range.${k}`,
				n.plate[k] === null ? '' : String(n.plate[k])
			])
		),
		...change
	};
}

const saveSensor = (n: Night, form: Record<string, string>) =>
	callAction(sensorPage.actions.save as never, {
		path: `/v/${n.venue.slug}/props/${n.well.id}/sensors/${n.plate.id}?/save`,
		params: { venue: n.venue.slug, prop: n.well.id, sensor: n.plate.id },
		person: asSession(n.designer),
		form
	});

/** Every check of the night passed (the plate with readings inside its band), then signed off. */
async function passAndSign(n: Night, showId: string) {
	const venue = n.ctx('show_manager');
	await syncChecklist(db, n.venue.id, showId);
	const list = await loadChecklist(db, venue, showId);
	for (const c of list.checks) {
		const reading = c.expected.mode === 'reading';
		const r = await recordResult(db, {
			venue,
			personId: n.manager.id,
			showId,
			body: reading
				? { clientId: randomUUID(), checkId: c.id, idleReading: 1480, presentReading: 1510 }
				: { clientId: randomUUID(), checkId: c.id, outcome: 'pass' }
		});
		expect(r.ok).toBe(true);
	}
	expect(await signOff(db, venue, showId, n.manager.id, null)).toEqual({ ok: true });
}

async function retestLines(n: Night, showId: string) {
	await syncChecklist(db, n.venue.id, showId);
	return (await loadChecklist(db, n.ctx('show_manager'), showId)).checks.filter(
		(c) => c.kind === 'retest'
	);
}

async function recordsOf(n: Night) {
	return db.select().from(changeRecords).where(eq(changeRecords.propId, n.well.id));
}

describe('change control', () => {
	it('lets a prop change freely before it has been on a signed-off night, keeping no record', async () => {
		const n = await night();
		// The plate was made with a 10 mm gap; 12 mm is a change, and nothing asks why.
		const saved = await saveSensor(n, plateForm(n, { 'settings.gapMm': '12' }));
		expect(saved.body).toMatchObject({ saved: true });
		expect(await recordsOf(n)).toEqual([]);
		expect(await retestLines(n, n.show.id)).toEqual([]);
	});

	it('after sign-off asks for a reason, keeps old and new values, and puts a re-test on the next night', async () => {
		const n = await night();
		await passAndSign(n, n.show.id);

		// Without a reason nothing is saved.
		const refused = await saveSensor(n, plateForm(n, { 'settings.gapMm': '12' }));
		expect(refused.status).toBe(400);
		expect(refused.body).toMatchObject({
			values: { 'settings.gapMm': '12' },
			errors: { changeReason: [expect.stringContaining('say why you are changing it')] }
		});
		const [unchanged] = await db.select().from(sensors).where(eq(sensors.id, n.plate.id));
		expect((unchanged.settings as { gapMm: number }).gapMm).toBe(10);
		expect(await recordsOf(n)).toEqual([]);

		// A save that changes nothing needs no reason and keeps no record.
		expect((await saveSensor(n, plateForm(n))).body).toMatchObject({ saved: true });
		expect(await recordsOf(n)).toEqual([]);

		const saved = await saveSensor(
			n,
			plateForm(n, {
				'settings.gapMm': '12',
				'settings.samplesAveraged': '8',
				changeReason: '  Plate re-glued after the rain  '
			})
		);
		expect(saved.body).toMatchObject({ saved: true });
		const [record] = await recordsOf(n);
		expect(record).toMatchObject({
			part: 'sensor',
			partName: 'Plate',
			sensorId: n.plate.id,
			summary: 'Gap to the hand 10 mm → 12 mm; Readings averaged 4 → 8',
			reason: 'Plate re-glued after the rain',
			personId: n.designer.id
		});
		expect(record.oldValue).toMatchObject({ settings: { gapMm: 10, samplesAveraged: 4 } });
		expect(record.newValue).toMatchObject({ settings: { gapMm: 12, samplesAveraged: 8 } });

		// The next night asks for one re-test of the Well; the signed night stays as it was signed.
		const [retest] = await retestLines(n, n.other.id);
		expect(retest).toMatchObject({
			propId: n.well.id,
			required: true,
			label: 'Well: re-test after changes since its last signed-off night'
		});
		expect(retest.detail).toContain(
			'Plate: Gap to the hand 10 mm → 12 mm; Readings averaged 4 → 8, because “Plate re-glued after the rain”.'
		);
		expect(await retestLines(n, n.show.id)).toEqual([]);

		// Once the next night is signed off (the re-test passed with the rest), later nights ask no more.
		await passAndSign(n, n.other.id);
		const [third] = await db
			.insert(shows)
			.values({
				venueId: n.venue.id,
				date: '2027-10-03',
				doorsOpen: new Date('2027-10-03T18:00:00Z'),
				doorsClose: new Date('2027-10-03T22:00:00Z'),
				crewCall: new Date('2027-10-03T16:00:00Z')
			})
			.returning();
		expect(await retestLines(n, third.id)).toEqual([]);
	});

	it('records output and curve changes, and a further change asks for a fresh re-test', async () => {
		const n = await night();
		await passAndSign(n, n.show.id);
		const [glow] = await db
			.select()
			.from(outputs)
			.where(and(eq(outputs.venueId, n.venue.id), eq(outputs.name, 'Glow')));
		const curve = (form: Record<string, string>) =>
			callAction(outputPage.actions.curve as never, {
				path: `/v/${n.venue.slug}/props/${n.well.id}/outputs/${glow.id}?/curve`,
				params: { venue: n.venue.slug, prop: n.well.id, output: glow.id },
				person: asSession(n.designer),
				form
			});
		const refused = await curve({ kind: 'gamma', exponent: '2.2' });
		expect(refused.status).toBe(400);
		expect(await recordsOf(n)).toEqual([]);
		expect(
			(await curve({ kind: 'gamma', exponent: '2.2', changeReason: 'Too bright' })).body
		).toMatchObject({ saved: true });
		const [first] = await retestLines(n, n.other.id);

		const save = await callAction(outputPage.actions.save as never, {
			path: `/v/${n.venue.slug}/props/${n.well.id}/outputs/${glow.id}?/save`,
			params: { venue: n.venue.slug, prop: n.well.id, output: glow.id },
			person: asSession(n.designer),
			form: {
				name: 'Glow',
				safeState: 'full',
				'settings.kind': 'led_string',
				'settings.colour': 'white',
				'settings.forwardV': '3.2',
				'settings.ledsInSeries': '3',
				'settings.strings': '1',
				'settings.currentMa': '15',
				'settings.supplyV': '12',
				'settings.switchDropV': '0.1',
				'settings.logicHighV': '5',
				'settings.gateThresholdMaxV': '2.5',
				'settings.continuousDrainMa': '200',
				changeReason: 'Dimmer for the queue line'
			}
		});
		expect(save.body).toMatchObject({ saved: true });
		const records = await recordsOf(n);
		expect(records.map((r) => [r.part, r.summary])).toEqual(
			expect.arrayContaining([
				['curve', 'Brightness curve none → gamma 2.2'],
				['output', 'Current per string 20 mA → 15 mA']
			])
		);
		const [second] = await retestLines(n, n.other.id);
		expect(second.id).not.toBe(first.id);
		expect(second.detail).toContain('Glow: Current per string 20 mA → 15 mA');
		expect(second.detail).toContain('Glow: Brightness curve none → gamma 2.2');
		// The first line is kept as removed, with any result it had, never deleted.
		const [old] = await db.select().from(checks).where(eq(checks.id, first.id));
		expect(old.removedAt).not.toBeNull();
	});

	it('keeps change records for good', async () => {
		const n = await night();
		await passAndSign(n, n.show.id);
		await saveSensor(n, plateForm(n, { 'settings.gapMm': '12', changeReason: 'Re-glued' }));
		const [record] = await recordsOf(n);
		await expect(
			db.execute(sql`update change_records set reason = 'nothing' where id = ${record.id}`)
		).rejects.toMatchObject({ cause: { message: expect.stringMatching(/append-only/) } });
		await expect(
			db.execute(sql`delete from change_records where id = ${record.id}`)
		).rejects.toMatchObject({ cause: { message: expect.stringMatching(/append-only/) } });
	});
});
