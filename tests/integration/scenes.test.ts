import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { controllers, outputs, props, sceneChanges, sensors } from '../../src/lib/server/db/schema';
import { loadScene } from '../../src/lib/server/scenes/model';
import {
	NameTaken,
	createScene,
	duplicateScene,
	refErrors,
	saveScene,
	sceneAnalysis,
	sceneContext
} from '../../src/lib/server/scenes/records';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();

async function setup() {
	const person = await makePerson(db, 'Scene Designer');
	const { venue } = await makeVenue(db, [[person.id, 'designer']]);
	const [board] = await db
		.insert(controllers)
		.values({
			venueId: venue.id,
			name: 'Board',
			supplyV: 5,
			clockHz: 16e6,
			timerBits: 16,
			pwmBits: 8,
			referenceV: 1.1,
			pinLimitMa: 20,
			supplyRatingA: 0.1
		})
		.returning();
	const [prop] = await db
		.insert(props)
		.values({ venueId: venue.id, name: 'Well', controllerId: board.id })
		.returning();
	const [sensor] = await db
		.insert(sensors)
		.values({
			venueId: venue.id,
			propId: prop.id,
			kind: 'button',
			name: 'Plate',
			settings: { kind: 'button' } as never
		})
		.returning();
	const [leds] = await db
		.insert(outputs)
		.values({
			venueId: venue.id,
			propId: prop.id,
			kind: 'led_string',
			name: 'Glow',
			safeState: 'full',
			curve: { kind: 'cie' },
			settings: {
				kind: 'led_string',
				colour: 'white',
				forwardV: 3.2,
				ledsInSeries: 3,
				strings: 5,
				currentMa: 20,
				supplyV: 12,
				switchDropV: 0.1,
				logicHighV: 5,
				gateThresholdMaxV: 2.5,
				continuousDrainMa: 200
			}
		})
		.returning();
	return { person, venue, sensor, leds };
}

const details = (name: string) => ({
	name,
	roomId: null,
	trigger: 'manual' as const,
	triggerSensorId: null,
	loopMs: null,
	lengthMs: 5000,
	rearmMs: 1000,
	runsOnShowNights: true,
	notes: null
});

describe('scenes', () => {
	it('keeps a change history that says what changed, and copies a scene whole', async () => {
		const { person, venue, sensor, leds } = await setup();
		const row = await createScene(db, venue.id, person.id, details('Swell'), {
			cues: [{ outputId: leds.id, startMs: 0, action: { type: 'set', level: 0.2 } }],
			responses: [
				{
					sensorId: sensor.id,
					outputId: leds.id,
					shape: 'step',
					threshold: 0.4,
					points: null,
					minLevel: 0,
					maxLevel: 1
				}
			]
		});
		await expect(createScene(db, venue.id, person.id, details('Swell'))).rejects.toThrow(NameTaken);

		const loaded = (await loadScene(db, venue.id, row.id))!;
		expect(loaded.scene.responses?.[0]).toMatchObject({ shape: 'step', threshold: 0.4 });
		const [cue] = loaded.cues;
		const saved = await saveScene(
			db,
			venue.id,
			person.id,
			loaded,
			{ ...details('Swell'), rearmMs: 2000 },
			{
				cues: [{ id: cue.id, outputId: leds.id, startMs: 300, action: cue.action }],
				responses: loaded.responses
			},
			() => 'Glow'
		);
		expect(saved.summary).toBe('Changed the re-arm time; moved or edited 1 cue on Glow.');
		const again = (await loadScene(db, venue.id, row.id))!;
		expect(again.cues.map((c) => [c.id, c.startMs])).toEqual([[cue.id, 300]]);
		const unchanged = await saveScene(
			db,
			venue.id,
			person.id,
			again,
			{ ...details('Swell'), rearmMs: 2000 },
			undefined,
			() => 'Glow'
		);
		expect(unchanged.changed).toBe(false);
		const history = await db.select().from(sceneChanges).where(eq(sceneChanges.sceneId, row.id));
		expect(history).toHaveLength(2);
		expect(history.every((h) => h.personId === person.id)).toBe(true);

		const copy = await duplicateScene(db, venue.id, person.id, again);
		expect(copy.name).toBe('Swell (copy)');
		const copied = (await loadScene(db, venue.id, copy.id))!;
		expect(copied.cues).toHaveLength(1);
		expect(copied.responses[0].shape).toBe('step');
	});

	it('checks the supply of the controller feeding the outputs, and refuses outputs of another venue', async () => {
		const { person, venue, leds } = await setup();
		const other = await setup();
		const row = await createScene(db, venue.id, person.id, details('Full glow'), {
			cues: [{ outputId: leds.id, startMs: 0, action: { type: 'set', level: 1 } }],
			responses: []
		});
		// 5 strings x 20 mA = 0.1 A on a 0.1 A supply: above 80 % of its rating (common practice)
		const analysis = (await sceneAnalysis(db, venue.id, row.id))!;
		const supply = analysis.findings.find((f) => f.code === 'supply-current');
		expect(supply?.severity).toBe('warning');
		expect(await sceneAnalysis(db, other.venue.id, row.id)).toBeNull();

		const context = await sceneContext(db, venue.id);
		expect(
			refErrors(context, details('x'), {
				cues: [{ outputId: other.leds.id, startMs: 0, action: { type: 'set', level: 1 } }]
			})
		).toEqual({ 'cues.0.outputId': ['Choose an output from the list.'] });
	});
});
