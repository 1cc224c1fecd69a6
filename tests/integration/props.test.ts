import { describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import {
	captures,
	propFiles,
	props,
	rooms,
	sensors,
	outputs
} from '../../src/lib/server/db/schema';
import { ingestCapture, ingestPropFile } from '../../src/lib/server/props/uploads';
import { listProps } from '../../src/lib/server/props/queries';
import { propQuerySchema } from '../../src/lib/schemas/prop';
import { makePerson, makeVenue, testDb } from './db';
import { PNG_1x1, testStore, uploadBody } from './uploads';

const db = testDb();
const store = testStore();
const body = uploadBody;

async function setup() {
	const person = await makePerson(db);
	const { venue } = await makeVenue(db, [[person.id, 'designer']]);
	const [prop] = await db.insert(props).values({ venueId: venue.id, name: 'Well' }).returning();
	const [sensor] = await db
		.insert(sensors)
		.values({
			venueId: venue.id,
			propId: prop.id,
			kind: 'capacitive',
			name: 'Plate',
			settings: {
				kind: 'capacitive',
				resistanceOhm: 1e6,
				plateAreaCm2: 100,
				gapMm: 20,
				strayPf: 10,
				samplesAveraged: 8,
				readingNoiseCounts: 2,
				handFraction: 0.5
			}
		})
		.returning();
	return { person, venue, prop, sensor };
}

function goodCsv(rows = 200) {
	const lines = ['time,reading,label'];
	for (let i = 0; i < rows; i++) {
		const present = i % 2 === 1;
		lines.push(
			`${(i * 0.01).toFixed(2)},${present ? 160 + (i % 7) : 100 + (i % 5)},${present ? 'present' : 'idle'}`
		);
	}
	return lines.join('\n') + '\n';
}

async function countCaptures(venueId: string) {
	const [r] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(captures)
		.where(eq(captures.venueId, venueId));
	return r.n;
}

describe('captures', () => {
	it('stores a good capture with its checksum, counts and calibration', async () => {
		const { person, venue, sensor } = await setup();
		const csv = goodCsv();
		const res = await ingestCapture({
			db,
			store,
			request: body(csv),
			venueId: venue.id,
			sensorId: sensor.id,
			personId: person.id,
			filename: 'well night 1.csv'
		});
		expect(res.ok).toBe(true);
		if (!res.ok) return;
		expect(res.capture.rows).toBe(200);
		expect(res.capture.idleRows).toBe(100);
		const { createHash } = await import('node:crypto');
		expect(res.capture.sha256).toBe(createHash('sha256').update(csv).digest('hex'));
		expect(await store.exists(res.capture.objectKey)).toBe(true);
		const summary = res.capture.summary as { calibration: { enter: number } | null };
		expect(summary.calibration?.enter).toBeGreaterThan(100);
	});

	it('refuses a malformed CSV with its line number and stores nothing', async () => {
		const { person, venue, sensor } = await setup();
		const csv = goodCsv(10).trimEnd().split('\n');
		csv.splice(6, 0, '0.055,lots,idle'); // becomes line 7 of the file
		const res = await ingestCapture({
			db,
			store,
			request: body(csv.join('\n')),
			venueId: venue.id,
			sensorId: sensor.id,
			personId: person.id,
			filename: 'bad.csv'
		});
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.status).toBe(400);
		expect(res.line).toBe(7);
		expect(res.message).toMatch(/Line 7: reading .lots. is not a number/);
		expect(await countCaptures(venue.id)).toBe(0);
	});

	it('refuses a binary file posing as a capture', async () => {
		const { person, venue, sensor } = await setup();
		const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
		const res = await ingestCapture({
			db,
			store,
			request: body(new Uint8Array(Buffer.concat([png, Buffer.alloc(64)]))),
			venueId: venue.id,
			sensorId: sensor.id,
			personId: person.id,
			filename: 'readings.csv'
		});
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.status).toBe(415);
		expect(await countCaptures(venue.id)).toBe(0);
	});

	it("refuses another venue's sensor", async () => {
		const a = await setup();
		const b = await setup();
		const res = await ingestCapture({
			db,
			store,
			request: body(goodCsv()),
			venueId: b.venue.id,
			sensorId: a.sensor.id,
			personId: b.person.id,
			filename: 'x.csv'
		});
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.status).toBe(404);
		expect(await countCaptures(a.venue.id)).toBe(0);
		expect(await countCaptures(b.venue.id)).toBe(0);
	});
});

describe('photos and wiring files', () => {
	async function fileCount(venueId: string) {
		const [r] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(propFiles)
			.where(eq(propFiles.venueId, venueId));
		return r.n;
	}

	it('stores a PNG by its content, with its SHA-256', async () => {
		const { person, venue, prop } = await setup();
		const res = await ingestPropFile({
			db,
			store,
			request: body(new Uint8Array(PNG_1x1)),
			venueId: venue.id,
			propId: prop.id,
			personId: person.id,
			filename: 'well.png'
		});
		expect(res.ok).toBe(true);
		if (!res.ok) return;
		expect(res.file.kind).toBe('photo');
		expect(res.file.contentType).toBe('image/png');
		expect(res.file.sha256).toMatch(/^[0-9a-f]{64}$/);
	});

	it('refuses a text file named like a photo', async () => {
		const { person, venue, prop } = await setup();
		const res = await ingestPropFile({
			db,
			store,
			request: body('not really a picture'),
			venueId: venue.id,
			propId: prop.id,
			personId: person.id,
			filename: 'photo.png'
		});
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.status).toBe(415);
		expect(await fileCount(venue.id)).toBe(0);
	});

	it('refuses a photo over 10 MB', async () => {
		const { person, venue, prop } = await setup();
		const big = new Uint8Array(10 * 1024 * 1024 + 10);
		big.set(PNG_1x1);
		const res = await ingestPropFile({
			db,
			store,
			request: body(big),
			venueId: venue.id,
			propId: prop.id,
			personId: person.id,
			filename: 'huge.png'
		});
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.status).toBe(413);
		expect(await fileCount(venue.id)).toBe(0);
	});

	it("refuses an upload to another venue's prop", async () => {
		const a = await setup();
		const b = await setup();
		const res = await ingestPropFile({
			db,
			store,
			request: body(new Uint8Array(PNG_1x1)),
			venueId: b.venue.id,
			propId: a.prop.id,
			personId: b.person.id,
			filename: 'x.png'
		});
		expect(res.ok).toBe(false);
		if (!res.ok) expect(res.status).toBe(404);
		expect(await fileCount(a.venue.id)).toBe(0);
	});
});

describe('the props table', () => {
	it('filters, sorts and pages 2,000 props quickly, within one venue', async () => {
		const { venue } = await setup();
		const other = await setup();
		const [room] = await db.insert(rooms).values({ venueId: venue.id, name: 'Barn' }).returning();
		const statuses = ['design', 'bench', 'installed', 'show_ready'] as const;
		const values = Array.from({ length: 2000 }, (_, i) => ({
			venueId: venue.id,
			name: `Prop ${String(i).padStart(4, '0')}`,
			roomId: i % 3 === 0 ? room.id : null,
			status: statuses[i % 4]
		}));
		for (let i = 0; i < values.length; i += 500)
			await db.insert(props).values(values.slice(i, i + 500));
		const [first] = await db
			.select({ id: props.id })
			.from(props)
			.where(and(eq(props.venueId, venue.id), eq(props.name, 'Prop 0003')));
		await db.insert(outputs).values({
			venueId: venue.id,
			propId: first.id,
			kind: 'relay',
			relayKind: 'fog',
			name: 'Fog',
			safeState: 'off',
			settings: {} as never
		});
		await db.execute(sql`analyze props`);

		const started = performance.now();
		const page = await listProps(
			db,
			venue.id,
			propQuerySchema.parse({
				room: room.id,
				status: 'installed',
				sort: 'name',
				dir: 'desc',
				page: '2'
			})
		);
		const search = await listProps(
			db,
			venue.id,
			propQuerySchema.parse({ q: '19', output: 'relay' })
		);
		const all = await listProps(db, venue.id, propQuerySchema.parse({ sort: 'updated' }));
		const elapsed = performance.now() - started;

		// i % 3 == 0 and i % 4 == 2: 167 props, 50 a page, so page 2 holds 50 of them
		expect(page.total).toBe(167);
		expect(page.rows).toHaveLength(50);
		expect(page.rows[0].name > page.rows[1].name).toBe(true);
		expect(search.total).toBe(0);
		expect(
			(await listProps(db, venue.id, propQuerySchema.parse({ q: '0003', output: 'relay' }))).total
		).toBe(1);
		expect(all.total).toBe(2001); // the 2,000 and the prop from setup()
		expect((await listProps(db, other.venue.id, propQuerySchema.parse({}))).total).toBe(1);
		// A generous bound on a 2-core machine; the point is no scan of other venues' props per row.
		expect(elapsed).toBeLessThan(3000);
	});

	it('ignores odd query values rather than failing', () => {
		const q = propQuerySchema.parse({ sort: 'drop table', page: '-3', status: 'haunted' });
		expect(q).toMatchObject({ sort: 'name', page: 1, status: undefined });
	});
});

describe('demo props', () => {
	it('load once however often the demo is loaded, and every demo setting passes its schema', async () => {
		const { seedDemo } = await import('../../src/lib/server/demo');
		const { DEMO_PROPS } = await import('../../src/lib/server/demo-props');
		const { sensorSettingsSchema } = await import('../../src/lib/schemas/sensor');
		const { outputSettingsSchema } = await import('../../src/lib/schemas/output');
		const { venues } = await import('../../src/lib/server/db/schema');
		await seedDemo(db);
		await seedDemo(db);
		const [trail] = await db.select().from(venues).where(eq(venues.slug, 'hollow-pines-trail'));
		const list = await db.select().from(props).where(eq(props.venueId, trail.id));
		expect(list.map((p) => p.name).sort()).toEqual(
			DEMO_PROPS['hollow-pines-trail'].map((p) => p.name).sort()
		);
		for (const p of Object.values(DEMO_PROPS).flat()) {
			for (const s of p.sensors)
				expect(sensorSettingsSchema.safeParse(s.settings).success).toBe(true);
			for (const o of p.outputs)
				expect(outputSettingsSchema.safeParse(o.settings).success).toBe(true);
		}
	});
});
