import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
	assignments,
	memberships,
	outputs,
	positions,
	props,
	sceneCues,
	scenes,
	standDownRestores,
	standDowns
} from '../../src/lib/server/db/schema';
import {
	restoreStandDown,
	signOff,
	standDown,
	standDownPreview
} from '../../src/lib/server/checklists/signoff';
import { recordResult } from '../../src/lib/server/checklists/record';
import { loadChecklist } from '../../src/lib/server/checklists/state';
import { syncChecklist } from '../../src/lib/server/checklists/sync';
import { startMailQueue, stopMailQueue } from '../../src/lib/server/mail/queue';
import { queueRunSheets } from '../../src/lib/server/runsheets/send';
import { scenesForShow } from '../../src/lib/server/scenes/for-show';
import { makePerson, testDb } from './db';
import { makeNight } from './night';
import { answerOf, asSession, callAction, eventFor, useTestEnv } from './routes';

vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const page =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/stand-down/+page.server');
const origin = 'https://gloaming.example';

beforeAll(() =>
	startMailQueue({ connectionString: inject('databaseUrl'), db, send: async () => {} })
);
afterAll(() => stopMailQueue());

/** The night, plus a well tech posted in the Well room and a second scene with the drop in the Barn. */
async function night() {
	const n = await makeNight(db);
	const di = await makePerson(db, 'Di Well');
	await db.insert(memberships).values({ venueId: n.venue.id, personId: di.id, role: 'crew' });
	const [wellTech] = await db
		.insert(positions)
		.values({ venueId: n.venue.id, name: 'Well tech', roomId: n.room.id })
		.returning();
	await db
		.insert(assignments)
		.values({ venueId: n.venue.id, showId: n.show.id, positionId: wellTech.id, personId: di.id });
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
	return { ...n, di, venueCtx: n.ctx('show_manager') };
}

describe('standing a prop down', () => {
	it('shows which scenes go to their safe state and whose run sheet changes, before anything is stored', async () => {
		const n = await night();
		const first = await standDownPreview(db, n.venueCtx, n.show.id, n.well.id, origin);
		expect(first).toMatchObject({
			ok: true,
			prop: { id: n.well.id, name: 'Well' },
			// The Well's plate drives only the Glow scene; Hiss in the Barn keeps running.
			scenes: [
				{
					name: 'Glow',
					room: 'Well room',
					outputs: [{ name: 'Glow', safeState: 'Lights to full' }],
					alreadySafe: false
				}
			],
			// Only the well tech's sheet lists the Glow scene; the room tech has no room.
			recipients: [{ name: 'Di Well', position: 'Well tech', sentBefore: false }],
			sheetsSent: false
		});
		expect(await db.select().from(standDowns).where(eq(standDowns.showId, n.show.id))).toEqual([]);

		// Once run sheets went out, the preview says the change is e-mailed at once.
		await queueRunSheets(db, { venueId: n.venue.id, showId: n.show.id, reason: 'send', origin });
		const after = await standDownPreview(db, n.venueCtx, n.show.id, n.well.id, origin);
		expect(after).toMatchObject({
			ok: true,
			sheetsSent: true,
			recipients: [{ name: 'Di Well', sentBefore: true }]
		});

		// A prop in no scene tonight is refused in words.
		const [idle] = await db
			.insert(props)
			.values({ venueId: n.venue.id, name: 'Spare skull' })
			.returning();
		expect(await standDownPreview(db, n.venueCtx, n.show.id, idle.id, origin)).toEqual({
			ok: false,
			message: "Spare skull is not in any of tonight's scenes."
		});
	});

	it('asks for a reason and a confirmation, and only a show manager may do it', async () => {
		const n = await night();
		const call = (person: typeof n.manager, form: Record<string, string>) =>
			callAction(page.actions.default as never, {
				path: `/v/${n.venue.slug}/shows/${n.show.id}/stand-down`,
				params: { venue: n.venue.slug, show: n.show.id },
				person: asSession(person),
				form
			});
		const unconfirmed = await call(n.manager, { propId: n.well.id, reason: 'Plate wet' });
		expect(unconfirmed.status).toBe(400);
		expect(unconfirmed.body).toMatchObject({
			values: { reason: 'Plate wet' },
			errors: { confirm: [expect.stringContaining('Tick the box')] }
		});
		const noReason = await call(n.manager, { propId: n.well.id, reason: ' ', confirm: 'yes' });
		expect(noReason.body).toMatchObject({
			errors: { reason: ['Say why the prop is stood down.'] }
		});
		expect(await db.select().from(standDowns).where(eq(standDowns.showId, n.show.id))).toEqual([]);

		expect(
			(await call(n.crewHere, { propId: n.well.id, reason: 'x x x', confirm: 'yes' })).status
		).toBe(403);

		const done = await call(n.manager, { propId: n.well.id, reason: 'Plate wet', confirm: 'yes' });
		expect(done.status).toBe(303);
		expect(done.location).toBe(
			`/v/${n.venue.slug}/shows/${n.show.id}?stood=${n.well.id}#stooddown-heading`
		);
		const glow = (await scenesForShow(db, n.venue.id, n.show.id)).find((s) => s.name === 'Glow');
		expect(glow?.stoodDown).toBe(true);
		expect(
			await call(n.manager, { propId: n.well.id, reason: 'Again', confirm: 'yes' })
		).toMatchObject({
			status: 400,
			body: { errors: { propId: ['Well is already stood down for this night.'] } }
		});
	});

	it('offers the failing props first and finds any other by name on a large night', async () => {
		const n = await night();
		const [hiss] = await db
			.select()
			.from(scenes)
			.where(and(eq(scenes.venueId, n.venue.id), eq(scenes.name, 'Hiss')));
		// Forty more props, each with a light cued in the Barn's scene: more than a short list holds.
		for (let i = 1; i <= 40; i++) {
			const [prop] = await db
				.insert(props)
				.values({ venueId: n.venue.id, name: `Lantern ${String(i).padStart(2, '0')}` })
				.returning();
			const [light] = await db
				.insert(outputs)
				.values({
					venueId: n.venue.id,
					propId: prop.id,
					kind: 'relay',
					relayKind: 'pneumatic',
					name: 'Lamp',
					settings: n.valve.settings,
					safeState: 'de_energised'
				})
				.returning();
			await db.insert(sceneCues).values({
				venueId: n.venue.id,
				sceneId: hiss.id,
				outputId: light.id,
				startMs: 0,
				action: { type: 'pulse', durationMs: 200 }
			});
		}
		await syncChecklist(db, n.venue.id, n.show.id);
		const glowCheck = (await loadChecklist(db, n.venueCtx, n.show.id)).checks.find(
			(c) => c.propId === n.well.id && c.kind === 'output_test'
		)!;
		const failed = await recordResult(db, {
			venue: n.venueCtx,
			personId: n.manager.id,
			showId: n.show.id,
			body: { clientId: randomUUID(), checkId: glowCheck.id, outcome: 'fail', note: 'Dead' }
		});
		expect(failed.ok).toBe(true);
		const load = async (query: string) => {
			const event = await eventFor({
				path: `/v/${n.venue.slug}/shows/${n.show.id}/stand-down${query}`,
				params: { venue: n.venue.slug, show: n.show.id },
				person: asSession(n.manager)
			});
			return (await answerOf(() => page.load(event as never))).body as {
				choices: { name: string }[];
				total: number;
				search: { q: string; matched: number } | null;
				chosen: string | null;
			};
		};
		const plain = await load('');
		expect(plain.total).toBe(42);
		// Unsearched, only the failing Well is listed, and chosen.
		expect(plain.choices.map((c) => c.name)).toEqual(['Well']);
		expect(plain.chosen).toBe(n.well.id);
		expect(plain.search).toEqual({ q: '', matched: 0, listed: 50 });
		const found = await load('?q=lantern%203');
		expect(found.choices.map((c) => c.name)).toEqual([
			'Lantern 30',
			'Lantern 31',
			'Lantern 32',
			'Lantern 33',
			'Lantern 34',
			'Lantern 35',
			'Lantern 36',
			'Lantern 37',
			'Lantern 38',
			'Lantern 39',
			'Well'
		]);
		expect(found.search?.matched).toBe(10);
		const none = await load('?q=gargoyle');
		expect(none.search?.matched).toBe(0);
		expect(none.choices.map((c) => c.name)).toEqual(['Well']);
	});

	it('can be restored before sign-off, keeping both reasons, and not after', async () => {
		const n = await night();
		await syncChecklist(db, n.venue.id, n.show.id);
		expect(
			await standDown(db, n.venueCtx, n.show.id, n.manager.id, {
				propId: n.well.id,
				reason: 'Plate wet'
			})
		).toEqual({ ok: true });
		const [down] = await db.select().from(standDowns).where(eq(standDowns.showId, n.show.id));
		expect(
			await restoreStandDown(db, n.venueCtx, n.show.id, n.manager.id, {
				standDownId: down.id,
				reason: 'Dried and re-tested'
			})
		).toEqual({ ok: true, propName: 'Well' });
		const state = await loadChecklist(db, n.venueCtx, n.show.id);
		expect(state.standDowns).toEqual([]);
		expect(state.restored).toMatchObject([
			{
				propName: 'Well',
				reason: 'Plate wet',
				restoreReason: 'Dried and re-tested',
				restoredBy: 'Ada Manager'
			}
		]);
		expect((await scenesForShow(db, n.venue.id, n.show.id)).some((s) => s.stoodDown)).toBe(false);
		expect(
			await restoreStandDown(db, n.venueCtx, n.show.id, n.manager.id, {
				standDownId: down.id,
				reason: 'Twice'
			})
		).toEqual({ ok: false, message: 'That prop is already restored.' });
		// History stays as it was written.
		await expect(
			db
				.update(standDownRestores)
				.set({ reason: 'changed' })
				.where(eq(standDownRestores.standDownId, down.id))
		).rejects.toThrow();

		// Stood down again the same night, then signed: the stand-down is fixed with the sign-off.
		await standDown(db, n.venueCtx, n.show.id, n.manager.id, {
			propId: n.well.id,
			reason: 'Wet again'
		});
		const again = await loadChecklist(db, n.venueCtx, n.show.id);
		expect(again.standDowns.map((d) => d.reason)).toEqual(['Wet again']);
		for (const c of again.checks.filter((c) => !c.stoodDown)) {
			await recordResult(db, {
				venue: n.venueCtx,
				personId: n.manager.id,
				showId: n.show.id,
				body: { clientId: randomUUID(), checkId: c.id, outcome: 'pass' }
			});
		}
		expect(await signOff(db, n.venueCtx, n.show.id, n.manager.id, null)).toEqual({ ok: true });
		expect(
			await restoreStandDown(db, n.venueCtx, n.show.id, n.manager.id, {
				standDownId: again.standDowns[0].id,
				reason: 'Late'
			})
		).toEqual({
			ok: false,
			message: 'This night is signed off; its stand-downs stay as they were signed.'
		});
	});
});
