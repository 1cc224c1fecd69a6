import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { props, sensors } from '../../src/lib/server/db/schema';
import { nest } from '../../src/lib/server/props/form';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, useTestEnv } from './routes';

// Field names are dotted paths that the server turns into nested objects; a name that walks into
// the prototype chain must be refused and must never change objects elsewhere in the process.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const propPage = await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/+page.server');

const plate = {
	name: 'Hand plate',
	'settings.kind': 'capacitive',
	'settings.resistanceOhm': '1000000',
	'settings.plateAreaCm2': '100',
	'settings.gapMm': '20',
	'settings.strayPf': '10',
	'settings.samplesAveraged': '8',
	'settings.readingNoiseCounts': '2',
	'settings.handFraction': '0.5',
	'range.debounceMs': '20',
	'range.rearmMs': '500'
};

let slug: string;
let propId: string;
let designer: ReturnType<typeof asSession>;

beforeAll(async () => {
	const d = await makePerson(db, 'Designer');
	const { venue } = await makeVenue(db, [[d.id, 'designer']]);
	const [p] = await db.insert(props).values({ venueId: venue.id, name: 'Well' }).returning();
	slug = venue.slug;
	propId = p.id;
	designer = asSession(d);
});

const addSensor = (form: Record<string, string>) =>
	callAction(propPage.actions.addSensor as never, {
		path: `/v/${slug}/props/${propId}?/addSensor`,
		params: { venue: slug, prop: propId },
		person: designer,
		form
	});

describe('nested form names', () => {
	it.each([
		['__proto__.notes', 'polluted'],
		['settings.__proto__.notes', 'polluted'],
		['constructor.prototype.notes', 'polluted'],
		['range.constructor.prototype.notes', 'polluted']
	])(
		'refuses a field named %s, stores nothing and leaves Object.prototype alone',
		async (name, value) => {
			const res = await addSensor({ ...plate, [name]: value });
			expect(res.status).toBe(400);
			expect((res.body!.errors as Record<string, string[]>).form[0]).toMatch(
				/a field this page does not have/
			);
			expect(({} as Record<string, unknown>).notes).toBeUndefined();
			expect(Object.prototype).not.toHaveProperty('notes');
			const stored = await db.select().from(sensors).where(eq(sensors.propId, propId));
			expect(stored).toHaveLength(0);
		}
	);

	it('still saves an ordinary nested form', async () => {
		const res = await addSensor(plate);
		expect(res.status).toBe(200);
		const [stored] = await db.select().from(sensors).where(eq(sensors.propId, propId));
		expect(stored.settings).toMatchObject({ kind: 'capacitive', gapMm: 20 });
		await db.delete(sensors).where(eq(sensors.propId, propId));
	});

	it('builds objects that inherit nothing', () => {
		const out = nest({ 'a.b': '1', c: '2' });
		expect(Object.getPrototypeOf(out)).toBeNull();
		expect(Object.getPrototypeOf(out.a)).toBeNull();
		expect('toString' in out).toBe(false);
		expect(() => nest({ 'a..b': '1' })).toThrow(/does not have/);
		expect(() => nest({ prototype: '1' })).toThrow(/does not have/);
	});
});
