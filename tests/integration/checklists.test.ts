import { describe, expect, inject, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
	checkPhotos,
	checkResults,
	checks,
	positions,
	sceneCues,
	scenes,
	showSceneExclusions,
	shows,
	signOffs,
	venues
} from '../../src/lib/server/db/schema';
import { createDb } from '../../src/lib/server/db/client';
import { syncChecklist } from '../../src/lib/server/checklists/sync';
import { loadChecklist } from '../../src/lib/server/checklists/state';
import { isShowPhotoKey, photoPrefix, recordResult } from '../../src/lib/server/checklists/record';
import { crewProblems, signOff, standDown } from '../../src/lib/server/checklists/signoff';
import { signOffBlockers } from '../../src/lib/checklists/view';
import { createLiveHub, notifyShow, showEventStream } from '../../src/lib/server/checklists/live';
import { makePerson, makeVenue, testDb } from './db';
import { makeNight } from './night';

const db = testDb();

const night = () => makeNight(db);

const keysOf = async (venue: { id: string; slug: string }, showId: string) =>
	(await loadChecklist(db, venue, showId)).checks.map((c) => c.key);

describe('generating a show checklist', () => {
	it('makes checks from the night scenes and keeps results through a scene change', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const keys = await keysOf(n.ctx('show_manager'), n.show.id);
		expect(keys).toContain(`sensor:${n.plate.id}`);
		expect(keys).not.toContain(`output:${n.valve.id}`);
		expect(keys.filter((k) => k.startsWith('venue:'))).toHaveLength(5);

		const plateCheck = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks.find(
			(c) => c.key === `sensor:${n.plate.id}`
		)!;
		const first = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: {
				clientId: randomUUID(),
				checkId: plateCheck.id,
				idleReading: 1480,
				presentReading: 1550
			}
		});
		expect(first.ok && first.result.outcome).toBe('pass');

		// A designer adds a timed scene with the pneumatic drop: its checks appear, the result stays.
		const [hiss] = await db
			.insert(scenes)
			.values({
				venueId: n.venue.id,
				roomId: n.barn.id,
				name: 'Hiss',
				trigger: 'timer',
				loopMs: 60000,
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
		await syncChecklist(db, n.venue.id, n.show.id);
		const after = await loadChecklist(db, n.ctx('crew'), n.show.id);
		expect(after.checks.map((c) => c.key)).toEqual(
			expect.arrayContaining([
				`output:${n.valve.id}`,
				`safety:pinch-guards:${n.drop.id}`,
				`safety:air-bled:${n.drop.id}`
			])
		);
		expect(after.checks.find((c) => c.id === plateCheck.id)!.latest!.outcome).toBe('pass');

		// Leaving the scene out of this show removes its checks from the list but deletes nothing.
		await db
			.insert(showSceneExclusions)
			.values({ showId: n.show.id, sceneId: hiss.id, venueId: n.venue.id });
		await syncChecklist(db, n.venue.id, n.show.id);
		expect(await keysOf(n.ctx('crew'), n.show.id)).not.toContain(`output:${n.valve.id}`);
		const [kept] = await db
			.select()
			.from(checks)
			.where(and(eq(checks.showId, n.show.id), eq(checks.key, `output:${n.valve.id}`)));
		expect(kept.removedAt).not.toBeNull();
	});

	it('judges sensor tests from the readings, not from what the phone says', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const state = await loadChecklist(db, n.ctx('crew'), n.show.id);
		const plate = state.checks.find((c) => c.kind === 'sensor_test')!;
		// idle 1490 is above the band 1472.5..1487.5
		const done = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: {
				clientId: randomUUID(),
				checkId: plate.id,
				outcome: 'pass',
				idleReading: 1490,
				presentReading: 1550
			}
		});
		expect(done.ok && done.result.outcome).toBe('fail');
		const missing = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: plate.id, idleReading: 'lots' }
		});
		expect(missing).toMatchObject({ ok: false, status: 400 });
	});
});

describe('who may record', () => {
	it('lets crew record only on the shows they are assigned to, and not in other venues', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const check = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks[0];
		const body = () => ({ clientId: randomUUID(), checkId: check.id, outcome: 'pass' });

		const mine = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: body()
		});
		expect(mine.ok).toBe(true);
		const notMine = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewOther.id,
			showId: n.show.id,
			body: body()
		});
		expect(notMine).toMatchObject({ ok: false, status: 403 });
		const manager = await recordResult(db, {
			venue: n.ctx('show_manager'),
			personId: n.manager.id,
			showId: n.show.id,
			body: body()
		});
		expect(manager.ok).toBe(true);

		// Crew of another venue, even an owner there, cannot reach this show.
		const stranger = await makePerson(db, 'Dee Elsewhere');
		const elsewhere = await makeVenue(db, [[stranger.id, 'owner']]);
		const foreign = await recordResult(db, {
			venue: { id: elsewhere.venue.id, role: 'owner' },
			personId: stranger.id,
			showId: n.show.id,
			body: body()
		});
		expect(foreign).toMatchObject({ ok: false, status: 404 });

		// A check of another show cannot be recorded through this one.
		await syncChecklist(db, n.venue.id, n.other.id);
		const otherCheck = (await loadChecklist(db, n.ctx('crew'), n.other.id)).checks[0];
		const crossed = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: otherCheck.id, outcome: 'pass' }
		});
		expect(crossed).toMatchObject({ ok: false, status: 404 });
		const count = await db.select().from(checkResults).where(eq(checkResults.showId, n.show.id));
		expect(count).toHaveLength(2);
	});
});

describe('check history', () => {
	it('stores a replayed result once, even when both copies arrive together', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const check = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks[0];
		const body = {
			clientId: randomUUID(),
			checkId: check.id,
			outcome: 'fail',
			note: 'Exit sign dark'
		};
		const args = { venue: n.ctx('crew'), personId: n.crewHere.id, showId: n.show.id, body };
		const [a, b] = await Promise.all([recordResult(db, args), recordResult(db, args)]);
		const again = await recordResult(db, args);
		expect([a.ok, b.ok, again.ok]).toEqual([true, true, true]);
		expect(again.ok && again.replay).toBe(true);
		const rows = await db
			.select()
			.from(checkResults)
			.where(eq(checkResults.clientId, body.clientId));
		expect(rows).toHaveLength(1);
	});

	it('refuses to change or delete a result: a correction is a new entry', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const check = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks[0];
		const args = (outcome: string) => ({
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: check.id, outcome }
		});
		const first = await recordResult(db, args('fail'));
		const id = first.ok ? first.result.id : '';
		await expect(
			db.update(checkResults).set({ outcome: 'pass' }).where(eq(checkResults.id, id))
		).rejects.toThrow();
		await expect(db.delete(checkResults).where(eq(checkResults.id, id))).rejects.toThrow();
		await recordResult(db, args('pass'));
		const state = await loadChecklist(db, n.ctx('crew'), n.show.id);
		expect(state.checks[0].latest!.outcome).toBe('pass');
		expect(state.history.filter((h) => h.checkId === check.id).map((h) => h.outcome)).toEqual([
			'pass',
			'fail'
		]);
		// Nor can removing the whole show take its history with it.
		await expect(db.delete(shows).where(eq(shows.id, n.show.id))).rejects.toThrow();
		expect(await db.select().from(checkResults).where(eq(checkResults.id, id))).toHaveLength(1);
	});
});

describe('sign-off', () => {
	it('is refused while a required check fails, allowed once its prop is stood down, and permanent', async () => {
		const n = await night();
		const venue = n.ctx('show_manager');
		await syncChecklist(db, n.venue.id, n.show.id);
		const state = await loadChecklist(db, venue, n.show.id);
		for (const c of state.checks) {
			await recordResult(db, {
				venue,
				personId: n.manager.id,
				showId: n.show.id,
				body:
					c.expected.mode === 'reading'
						? { clientId: randomUUID(), checkId: c.id, idleReading: 1480, presentReading: 1400 }
						: { clientId: randomUUID(), checkId: c.id, outcome: 'pass' }
			});
		}
		const refused = await signOff(db, venue, n.show.id, n.manager.id, null);
		expect(refused.ok).toBe(false);
		expect(!refused.ok && refused.blockers).toEqual([
			expect.stringContaining('Failed: Well: Plate sensor test')
		]);

		expect(
			await standDown(db, venue, n.show.id, n.manager.id, { propId: n.drop.id, reason: 'x' })
		).toMatchObject({ ok: false });
		expect(
			await standDown(db, venue, n.show.id, n.manager.id, {
				propId: n.well.id,
				reason: 'Plate reads high after rain'
			})
		).toEqual({ ok: true });
		expect(await signOff(db, venue, n.show.id, n.manager.id, 'Well dark tonight')).toEqual({
			ok: true
		});
		expect(await signOff(db, venue, n.show.id, n.manager.id, null)).toMatchObject({ ok: false });
		await expect(
			db.update(signOffs).set({ note: 'changed' }).where(eq(signOffs.showId, n.show.id))
		).rejects.toThrow();

		const after = await loadChecklist(db, venue, n.show.id);
		expect(after.signOff?.personName).toBe('Ada Manager');
		expect(after.standDowns.map((d) => d.reason)).toEqual(['Plate reads high after rain']);
		// The signed night takes a result only as a late correction, which changes nothing signed.
		const late = await recordResult(db, {
			venue,
			personId: n.manager.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: state.checks[0].id, outcome: 'fail' }
		});
		expect(late).toMatchObject({ ok: true, result: { afterSignOff: true } });
		const corrected = await loadChecklist(db, venue, n.show.id);
		expect(corrected.corrections.map((r) => r.outcome)).toEqual(['fail']);
		expect(corrected.signOff?.at).toBe(after.signOff?.at);
		expect(corrected.checks[0].latest?.afterSignOff).toBe(false);
		// Deleting the venue still cascades through the append-only tables.
		await db.delete(venues).where(eq(venues.id, n.venue.id));
		expect(await db.select().from(signOffs).where(eq(signOffs.showId, n.show.id))).toHaveLength(0);
	});
});

describe('live progress', () => {
	it('streams a change to the browsers watching a show and lets go when they leave', async () => {
		const listener = createDb(inject('databaseUrl'), { max: 2 });
		try {
			const hub = createLiveHub(listener.sql);
			const showId = randomUUID();
			const reader = showEventStream(hub, showId).getReader();
			const dec = new TextDecoder();
			expect(dec.decode((await reader.read()).value)).toContain('retry: 3000');
			expect(hub.watching(showId)).toBe(1);
			await notifyShow(db, randomUUID());
			await notifyShow(db, showId);
			expect(dec.decode((await reader.read()).value)).toMatch(/^event: changed\n/);
			await reader.cancel();
			expect(hub.watching(showId)).toBe(0);
		} finally {
			await listener.sql.end();
		}
	});
});

const minutes = (n: number) => new Date(Date.now() + n * 60_000).toISOString();

describe('recorded and received times', () => {
	it("keeps the phone's time, marks late arrivals, and does not order by an absurd clock", async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const walk = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks.find(
			(c) => c.expected.mode !== 'reading'
		)!;
		const send = (outcome: string, recordedAt?: unknown) =>
			recordResult(db, {
				venue: n.ctx('crew'),
				personId: n.crewHere.id,
				showId: n.show.id,
				body: { clientId: randomUUID(), checkId: walk.id, outcome, recordedAt }
			});
		// Recorded offline 75 minutes ago, sent now: the phone's time is kept, the arrival marked late.
		const offline = await send('fail', minutes(-75));
		expect(offline.ok).toBe(true);
		if (!offline.ok) return;
		expect(offline.result.recordedAt.toISOString()).toBe(
			minutes(-75).slice(0, 16) + offline.result.recordedAt.toISOString().slice(16)
		);
		expect(Date.now() - offline.result.receivedAt.getTime()).toBeLessThan(60_000);
		expect(offline.result.clockSuspect).toBe(false);
		// An older pass arriving after it does not hide the newer fail.
		await send('pass', minutes(-90));
		let state = await loadChecklist(db, n.ctx('crew'), n.show.id);
		let mine = state.checks.find((c) => c.id === walk.id)!;
		expect(mine.latest).toMatchObject({ outcome: 'fail', late: true, clockSuspect: false });
		expect(state.history.filter((h) => h.checkId === walk.id).map((h) => h.outcome)).toEqual([
			'fail',
			'pass'
		]);

		// A clock a day ahead, or a time 30 hours old: kept but flagged, ordered by received time.
		const ahead = await send('pass', minutes(24 * 60));
		const old = await send('fail', minutes(-30 * 60));
		expect(ahead).toMatchObject({ ok: true, result: { clockSuspect: true } });
		expect(old).toMatchObject({ ok: true, result: { clockSuspect: true } });
		state = await loadChecklist(db, n.ctx('crew'), n.show.id);
		mine = state.checks.find((c) => c.id === walk.id)!;
		// The 30-hour-old fail arrived last, so by received time it is the newest.
		expect(mine.latest).toMatchObject({ outcome: 'fail', clockSuspect: true, late: false });
		// A minute ahead is within the allowed skew.
		expect(await send('pass', minutes(1))).toMatchObject({
			ok: true,
			result: { clockSuspect: false }
		});
		// Not a time at all: refused in words.
		const bad = await send('pass', 'half past nine');
		expect(bad).toMatchObject({ ok: false, status: 400 });
		expect(!bad.ok && bad.errors?.recordedAt?.[0]).toMatch(/ISO 8601/);
		// No time from the phone: the received time stands for both.
		const plain = await send('pass');
		expect(plain.ok && plain.result.recordedAt.getTime()).toBe(
			plain.ok && plain.result.receivedAt.getTime()
		);
	});
});

describe('check photos', () => {
	it('stores only a photo the server made for this show, never a key from the phone', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		const walk = (await loadChecklist(db, n.ctx('crew'), n.show.id)).checks.find(
			(c) => c.expected.mode !== 'reading'
		)!;
		const send = (extra: Record<string, unknown>) =>
			recordResult(db, {
				venue: n.ctx('crew'),
				personId: n.crewHere.id,
				showId: n.show.id,
				body: { clientId: randomUUID(), checkId: walk.id, outcome: 'fail', ...extra }
			});
		const prefix = photoPrefix(n.venue.id, n.show.id);
		// A key sent by the phone, even one that climbs out of the show's folder, is ignored.
		const sneaky = await send({ photoKey: `${prefix}../../../../other-venue/photo.jpg` });
		expect(sneaky).toMatchObject({ ok: true, result: { photoKey: null } });
		// A photo of another show is refused.
		const [elsewhere] = await db
			.insert(checkPhotos)
			.values({
				venueId: n.venue.id,
				showId: n.other.id,
				key: `${photoPrefix(n.venue.id, n.other.id)}${randomUUID()}.jpg`,
				contentType: 'image/jpeg'
			})
			.returning();
		expect(await send({ photoId: elsewhere.id })).toMatchObject({ ok: false, status: 400 });
		const key = `${prefix}${randomUUID()}.jpg`;
		const [own] = await db
			.insert(checkPhotos)
			.values({ venueId: n.venue.id, showId: n.show.id, key, contentType: 'image/jpeg' })
			.returning();
		expect(await send({ photoId: own.id })).toMatchObject({ ok: true, result: { photoKey: key } });
		// The photo route serves only plain keys under the show's own folder.
		expect(isShowPhotoKey(key, n.venue.id, n.show.id)).toBe(true);
		expect(isShowPhotoKey(`${prefix}../../x/${randomUUID()}.jpg`, n.venue.id, n.show.id)).toBe(
			false
		);
		expect(isShowPhotoKey(key, n.venue.id, n.other.id)).toBe(false);
	});
});

describe('sign-off against results arriving at the same time', () => {
	it('never signs a night whose newest result on a required check is a fail', async () => {
		for (let round = 0; round < 4; round++) {
			const n = await night();
			const venue = n.ctx('show_manager');
			await syncChecklist(db, n.venue.id, n.show.id);
			const state = await loadChecklist(db, venue, n.show.id);
			for (const c of state.checks)
				await recordResult(db, {
					venue,
					personId: n.manager.id,
					showId: n.show.id,
					body:
						c.expected.mode === 'reading'
							? { clientId: randomUUID(), checkId: c.id, idleReading: 1480, presentReading: 1500 }
							: { clientId: randomUUID(), checkId: c.id, outcome: 'pass' }
				});
			const target = state.checks.find((c) => c.required && c.expected.mode !== 'reading')!;
			// Failing results spread over the sign-off's few milliseconds, so some land inside it.
			const fails = Array.from({ length: 12 }, (_, i) =>
				new Promise((ok) => setTimeout(ok, i * 2)).then(() =>
					recordResult(db, {
						venue: n.ctx('crew'),
						personId: n.crewHere.id,
						showId: n.show.id,
						body: { clientId: randomUUID(), checkId: target.id, outcome: 'fail' }
					})
				)
			);
			const [signed, ...stored] = await Promise.all([
				signOff(db, venue, n.show.id, n.manager.id, null),
				...fails
			]);
			// Every failing result is stored, either before the sign-off (which then refuses) or after it.
			expect(stored.every((r) => r.ok)).toBe(true);
			const after = await loadChecklist(db, venue, n.show.id);
			if (signed.ok) {
				expect(signOffBlockers(after.checks)).toEqual([]);
				const rows = await db
					.select()
					.from(checkResults)
					.where(and(eq(checkResults.checkId, target.id), eq(checkResults.outcome, 'fail')));
				expect(rows.every((r) => r.afterSignOff)).toBe(true);
				expect(after.corrections).toHaveLength(rows.length);
			} else {
				expect(after.signOff).toBeNull();
				expect(after.history.filter((h) => h.afterSignOff)).toEqual([]);
			}
		}
	});
});

describe("sign-off and the night's crew problems", () => {
	it('asks for each problem to be acknowledged and keeps the acknowledgements with the sign-off', async () => {
		const n = await night();
		const venue = n.ctx('show_manager');
		await db
			.insert(positions)
			.values({ venueId: n.venue.id, name: 'Safety lead', safetyPost: true });
		await syncChecklist(db, n.venue.id, n.show.id);
		const state = await loadChecklist(db, venue, n.show.id);
		for (const c of state.checks)
			await recordResult(db, {
				venue,
				personId: n.manager.id,
				showId: n.show.id,
				body:
					c.expected.mode === 'reading'
						? { clientId: randomUUID(), checkId: c.id, idleReading: 1480, presentReading: 1500 }
						: { clientId: randomUUID(), checkId: c.id, outcome: 'pass' }
			});
		const problems = await crewProblems(db, n.venue.id, n.show.id);
		expect(problems.map((p) => p.message)).toEqual([
			'Safety lead is required and nobody is assigned.'
		]);
		const refused = await signOff(db, venue, n.show.id, n.manager.id, null);
		expect(refused).toMatchObject({ ok: false, unacknowledged: [{ kind: 'unfilled' }] });
		expect(refused.ok ? '' : refused.message).toMatch(/Acknowledge/);
		expect(
			await signOff(db, venue, n.show.id, n.manager.id, null, ['unfilled:nope'])
		).toMatchObject({ ok: false });
		expect(await signOff(db, venue, n.show.id, n.manager.id, null, [problems[0].key])).toEqual({
			ok: true
		});
		const after = await loadChecklist(db, venue, n.show.id);
		expect(after.signOff?.acknowledged).toEqual([
			{ key: problems[0].key, message: 'Safety lead is required and nobody is assigned.' }
		]);
		await expect(
			db.update(signOffs).set({ acknowledged: [] }).where(eq(signOffs.showId, n.show.id))
		).rejects.toThrow();
	});
});
