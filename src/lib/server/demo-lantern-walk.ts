import { and, eq } from 'drizzle-orm';
import type { Db } from './db/client';
import { outputs, rooms, sceneCues, sceneResponses, scenes, sensors } from './db/schema';

/**
 * The trail's demo scene for run sheets: the well's lanterns follow a reaching hand, then swell
 * and flicker fast enough to need photosensitivity signage. Invented; safe to run twice.
 */
export async function seedLanternWalk(db: Db, venueId: string) {
	const [existing] = await db
		.select({ id: scenes.id })
		.from(scenes)
		.where(and(eq(scenes.venueId, venueId), eq(scenes.name, 'Lantern walk')));
	if (existing) return;
	const [room] = await db
		.select({ id: rooms.id })
		.from(rooms)
		.where(and(eq(rooms.venueId, venueId), eq(rooms.name, 'Lantern Walk')));
	const [plate] = await db
		.select({ id: sensors.id })
		.from(sensors)
		.where(and(eq(sensors.venueId, venueId), eq(sensors.name, 'Well-lip plate')));
	const [lanterns] = await db
		.select({ id: outputs.id })
		.from(outputs)
		.where(and(eq(outputs.venueId, venueId), eq(outputs.name, 'Warm lanterns')));
	if (!room || !plate || !lanterns) return;
	const [scene] = await db
		.insert(scenes)
		.values({
			venueId,
			roomId: room.id,
			name: 'Lantern walk',
			trigger: 'sensor',
			triggerSensorId: plate.id,
			lengthMs: 12_000,
			rearmMs: 8_000,
			notes: 'Lanterns answer the hand in the well, then gutter as if a wind went through.'
		})
		.returning({ id: scenes.id });
	await db.insert(sceneResponses).values({
		venueId,
		sceneId: scene.id,
		sensorId: plate.id,
		outputId: lanterns.id,
		shape: 'rise',
		minLevel: 0.2,
		maxLevel: 0.8
	});
	await db.insert(sceneCues).values([
		{
			venueId,
			sceneId: scene.id,
			outputId: lanterns.id,
			startMs: 0,
			action: { type: 'fade', level: 0.6, durationMs: 2000 }
		},
		{
			venueId,
			sceneId: scene.id,
			outputId: lanterns.id,
			startMs: 6000,
			action: { type: 'strobe', rateHz: 6, durationMs: 1500, level: 1 }
		},
		{
			venueId,
			sceneId: scene.id,
			outputId: lanterns.id,
			startMs: 9000,
			action: { type: 'fade', level: 0.2, durationMs: 3000 }
		}
	]);
}
