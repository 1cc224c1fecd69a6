import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { captures, propFiles, props, sensors } from '../../src/lib/server/db/schema';
import { ObjectStore } from '../../src/lib/server/objects';
import { discardObjects } from '../../src/lib/server/object-cleanup';
import { ingestCapture, ingestPropFile } from '../../src/lib/server/props/uploads';
import {
	removeCapture,
	removeProp,
	removePropFile,
	removeSensor
} from '../../src/lib/server/props/removal';
import { makePerson, makeVenue, testDb } from './db';
import { PNG_1x1, testStore, uploadBody } from './uploads';

const db = testDb();
const store = testStore();

const CSV = 'reading,label\n100,idle\n101,idle\n160,present\n162,present\n';
const body = uploadBody;

/** A prop with one sensor, one capture and one photo, all in the store. */
async function stocked() {
	const person = await makePerson(db);
	const { venue } = await makeVenue(db, [[person.id, 'designer']]);
	const [prop] = await db
		.insert(props)
		.values({ venueId: venue.id, name: 'Crypt lid' })
		.returning();
	const [sensor] = await db
		.insert(sensors)
		.values({
			venueId: venue.id,
			propId: prop.id,
			kind: 'button',
			name: 'Lid button',
			settings: { kind: 'button', latching: false }
		})
		.returning();
	const cap = await ingestCapture({
		db,
		store,
		request: body(CSV),
		venueId: venue.id,
		sensorId: sensor.id,
		personId: person.id,
		filename: 'lid.csv'
	});
	const photo = await ingestPropFile({
		db,
		store,
		request: body(new Uint8Array(PNG_1x1)),
		venueId: venue.id,
		propId: prop.id,
		personId: person.id,
		filename: 'lid.png'
	});
	if (!cap.ok || !photo.ok) throw new Error('setup upload failed');
	const captureKey = cap.capture.objectKey;
	const photoKey = photo.file.objectKey;
	expect(await store.exists(captureKey)).toBe(true);
	expect(await store.exists(photoKey)).toBe(true);
	// The store keeps exactly the bytes sent (no transfer framing around them).
	const stored = (await store.get(photoKey)).body;
	const chunks: Buffer[] = [];
	for await (const c of stored) chunks.push(Buffer.from(c));
	expect(Buffer.concat(chunks).equals(PNG_1x1)).toBe(true);
	return { venue, prop, sensor, capture: cap.capture, photo: photo.file, captureKey, photoKey };
}

describe('removing uploads deletes their objects', () => {
	it('removing a prop deletes its captures and photos from the store', async () => {
		const s = await stocked();
		const removal = await removeProp(db, s.venue.id, s.prop.id);
		expect(removal.removed).toBe(true);
		expect(removal.keys.sort()).toEqual([s.captureKey, s.photoKey].sort());
		expect(await discardObjects(store, removal.keys)).toEqual([]);
		expect(await store.exists(s.captureKey)).toBe(false);
		expect(await store.exists(s.photoKey)).toBe(false);
		expect(await db.select().from(captures).where(eq(captures.sensorId, s.sensor.id))).toEqual([]);
	});

	it('removing a sensor deletes its captures; the photo stays', async () => {
		const s = await stocked();
		const removal = await removeSensor(db, s.venue.id, s.prop.id, s.sensor.id);
		expect(removal.keys).toEqual([s.captureKey]);
		await discardObjects(store, removal.keys);
		expect(await store.exists(s.captureKey)).toBe(false);
		expect(await store.exists(s.photoKey)).toBe(true);
	});

	it('removing one capture or one file deletes just that object', async () => {
		const s = await stocked();
		const c = await removeCapture(db, s.venue.id, s.sensor.id, s.capture.id);
		await discardObjects(store, c.keys);
		expect(await store.exists(s.captureKey)).toBe(false);
		expect(await store.exists(s.photoKey)).toBe(true);
		const f = await removePropFile(db, s.venue.id, s.prop.id, s.photo.id);
		await discardObjects(store, f.keys);
		expect(await store.exists(s.photoKey)).toBe(false);
	});

	it("another venue's ids remove nothing", async () => {
		const s = await stocked();
		const { venue: other } = await makeVenue(db);
		expect(await removeProp(db, other.id, s.prop.id)).toEqual({ removed: false, keys: [] });
		expect(await removePropFile(db, other.id, s.prop.id, s.photo.id)).toEqual({
			removed: false,
			keys: []
		});
		expect(await store.exists(s.photoKey)).toBe(true);
	});

	it('a store that is down leaves the removal done and reports the keys left behind', async () => {
		const s = await stocked();
		const down = new ObjectStore({
			endpoint: 'http://127.0.0.1:9',
			bucket: 'gloaming-it',
			accessKeyId: 'S3RVER',
			secretAccessKey: 'S3RVER'
		});
		const removal = await removePropFile(db, s.venue.id, s.prop.id, s.photo.id);
		const left = await discardObjects(down, removal.keys);
		expect(left).toEqual([s.photoKey]);
		expect(await db.select().from(propFiles).where(eq(propFiles.id, s.photo.id))).toEqual([]);
	});
});
