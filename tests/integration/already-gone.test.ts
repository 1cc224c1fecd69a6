import { beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { mailMessages, outputs, props, shows } from '../../src/lib/server/db/schema';
import { deliverMail, storeMail } from '../../src/lib/server/mail/outbox';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, callHandler, useTestEnv } from './routes';

// Removing something that is not there says it is already gone instead of answering success; an
// API asked about another venue's show answers 404; a delivered message keeps no error text.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const propPage = await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/+page.server');
const sensorPage =
	await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/+page.server');
const showPage = await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/+page.server');
const nightsPage = await import('../../src/routes/(app)/v/[venue]/my-nights/+page.server');
const runSheetsApi =
	await import('../../src/routes/api/v/[venue]/shows/[show=uuid]/run-sheets/+server');
const { sensors } = await import('../../src/lib/server/db/schema');

let slug: string;
let venueId: string;
let propId: string;
let sensorId: string;
let showId: string;
let owner: ReturnType<typeof asSession>;
/** Another venue's output, show and prop. */
let theirs: { outputId: string; showId: string };

async function nightIn(venue: string, date = '2030-10-31') {
	const [s] = await db
		.insert(shows)
		.values({
			venueId: venue,
			date,
			doorsOpen: new Date(`${date}T18:00:00Z`),
			doorsClose: new Date(`${date}T22:00:00Z`),
			crewCall: new Date(`${date}T16:00:00Z`)
		})
		.returning();
	return s.id;
}

async function outputOn(venue: string, prop: string) {
	const [o] = await db
		.insert(outputs)
		.values({
			venueId: venue,
			propId: prop,
			kind: 'relay',
			name: 'Fog burst',
			settings: {} as never,
			safeState: 'off'
		})
		.returning();
	return o.id;
}

beforeAll(async () => {
	const o = await makePerson(db, 'Odile Fenwick');
	owner = asSession(o);
	const { venue } = await makeVenue(db, [[o.id, 'owner']]);
	slug = venue.slug;
	venueId = venue.id;
	const [p] = await db.insert(props).values({ venueId, name: 'Crypt lid' }).returning();
	propId = p.id;
	const [s] = await db
		.insert(sensors)
		.values({
			venueId,
			propId,
			name: 'Lid plate',
			kind: 'button',
			settings: { kind: 'button' } as never
		})
		.returning();
	sensorId = s.id;
	showId = await nightIn(venueId);
	const other = await makePerson(db, 'Ansel Marsh');
	const { venue: v2 } = await makeVenue(db, [[other.id, 'owner']]);
	const [p2] = await db.insert(props).values({ venueId: v2.id, name: 'Gate' }).returning();
	theirs = { outputId: await outputOn(v2.id, p2.id), showId: await nightIn(v2.id) };
});

const onProp = (action: string) => ({
	path: `/v/${slug}/props/${propId}?/${action}`,
	params: { venue: slug, prop: propId },
	person: owner
});

describe('removing what is not there', () => {
	it('an output, sensor or file of the prop that is not there is "already gone" (404)', async () => {
		const mine = await outputOn(venueId, propId);
		const first = await callAction(propPage.actions.removeOutput as never, {
			...onProp('removeOutput'),
			form: { id: mine }
		});
		expect(first).toMatchObject({ status: 200, body: { removed: true } });
		for (const [action, id, message] of [
			['removeOutput', mine, 'That output was already removed.'],
			['removeOutput', theirs.outputId, 'That output was already removed.'],
			['removeSensor', randomUUID(), 'That sensor was already removed.'],
			['removeFile', randomUUID(), 'That file was already removed.']
		]) {
			const res = await callAction(
				propPage.actions[action as keyof typeof propPage.actions] as never,
				{ ...onProp(action), form: { id } }
			);
			expect(res, `${action} ${id}`).toMatchObject({ status: 404, body: { message } });
		}
		// The other venue's output is untouched.
		expect(await db.select().from(outputs).where(eq(outputs.id, theirs.outputId))).toHaveLength(1);
	});

	it('a capture that is not there is "already gone" (404)', async () => {
		const res = await callAction(sensorPage.actions.removeCapture as never, {
			path: `/v/${slug}/props/${propId}/sensors/${sensorId}?/removeCapture`,
			params: { venue: slug, prop: propId, sensor: sensorId },
			person: owner,
			form: { captureId: randomUUID() }
		});
		expect(res).toMatchObject({
			status: 404,
			body: { action: 'removeCapture', message: 'That capture was already removed.' }
		});
	});

	it('putting back a scene that was not left out says so', async () => {
		const res = await callAction(showPage.actions.include as never, {
			path: `/v/${slug}/shows/${showId}?/include`,
			params: { venue: slug, show: showId },
			person: owner,
			form: { sceneId: randomUUID() }
		});
		expect(res).toMatchObject({
			status: 404,
			body: { action: 'include', message: 'That scene is already in this night.' }
		});
	});

	it('marking available a night that was not marked away says so', async () => {
		const res = await callAction(nightsPage.actions.available as never, {
			path: `/v/${slug}/my-nights?/available`,
			params: { venue: slug },
			person: owner,
			form: { date: '2030-10-31' }
		});
		expect(res).toMatchObject({
			status: 404,
			body: { action: 'available', message: 'You were not marked away on that night.' }
		});
	});
});

describe('another venue’s show through the API', () => {
	it('is a 404, not an empty list', async () => {
		const ask = (id: string) =>
			callHandler(runSheetsApi.GET as never, {
				path: `/api/v/${slug}/shows/${id}/run-sheets`,
				params: { venue: slug, show: id },
				person: owner
			});
		expect(await ask(theirs.showId)).toMatchObject({
			status: 404,
			body: { message: 'There is no such show.' }
		});
		expect(await ask(showId)).toMatchObject({ status: 200, body: { total: 0 } });
	});
});

describe('a message delivered after a failed try', () => {
	it('keeps no error text', async () => {
		const { message } = await storeMail(db, {
			venueId,
			kind: 'run_sheet',
			subjectId: showId,
			recipient: 'crew@gloaming.test',
			subject: 'Run sheet',
			html: '<p>x</p>',
			text: 'x'
		});
		const down = await deliverMail(
			db,
			message.id,
			async () => {
				throw new Error('connect ECONNREFUSED');
			},
			{ lastTry: false }
		);
		expect(down).toMatchObject({ outcome: 'error' });
		const [failed] = await db.select().from(mailMessages).where(eq(mailMessages.id, message.id));
		expect(failed.lastError).toBe('connect ECONNREFUSED');
		expect(await deliverMail(db, message.id, async () => {}, { lastTry: false })).toEqual({
			outcome: 'sent'
		});
		const [sent] = await db.select().from(mailMessages).where(eq(mailMessages.id, message.id));
		expect(sent).toMatchObject({ status: 'sent', attempts: 2, lastError: null });
	});
});
