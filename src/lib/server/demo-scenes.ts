import { and, eq } from 'drizzle-orm';
import type { Db } from './db/client';
import {
	outputs,
	rooms,
	sceneChanges,
	sceneCues,
	sceneResponses,
	scenes,
	sensors
} from './db/schema';
import type { CueAction, ResponseShape } from '../scenes/types';

// Invented scenes for the demo venues, using the demo props by name. Matched by name, so loading
// twice changes nothing. Strobes and flickers stay at 3 flashes a second or fewer.
type DemoScene = {
	name: string;
	room: string;
	trigger: 'sensor' | 'timer' | 'manual';
	triggerSensor?: string;
	loopMs?: number;
	lengthMs: number;
	rearmMs: number;
	notes: string;
	cues: { output: string; startMs: number; action: CueAction }[];
	responses: {
		sensor: string;
		output: string;
		shape: ResponseShape;
		threshold?: number;
		points?: [number, number][];
		minLevel: number;
		maxLevel: number;
	}[];
};

export const DEMO_SCENES: Record<string, DemoScene[]> = {
	'hollow-pines-trail': [
		{
			name: 'Well lanterns swell',
			room: 'Lantern Walk',
			trigger: 'sensor',
			triggerSensor: 'Well-lip plate',
			lengthMs: 8000,
			rearmMs: 1500,
			notes: 'The lanterns below the well lip brighten as a hand reaches in, then gutter out.',
			cues: [
				{ output: 'Warm lanterns', startMs: 0, action: { type: 'set', level: 0.15 } },
				{
					output: 'Warm lanterns',
					startMs: 5000,
					action: { type: 'strobe', rateHz: 2, durationMs: 1500, level: 0.6 }
				},
				{
					output: 'Warm lanterns',
					startMs: 6500,
					action: { type: 'fade', level: 0.15, durationMs: 1500 }
				}
			],
			responses: [
				{
					sensor: 'Well-lip plate',
					output: 'Warm lanterns',
					shape: 'rise',
					minLevel: 0.15,
					maxLevel: 1
				}
			]
		},
		{
			name: 'Loft drop',
			room: 'Hollow Barn',
			trigger: 'sensor',
			triggerSensor: 'Threshold beam',
			lengthMs: 6000,
			rearmMs: 8000,
			notes:
				'The sack drops a moment after guests cross the beam; the crew resets it between groups.',
			cues: [{ output: 'Drop valve', startMs: 1500, action: { type: 'pulse', durationMs: 250 } }],
			responses: []
		},
		{
			name: 'Owl call mist',
			room: 'Bone Orchard',
			trigger: 'timer',
			loopMs: 60_000,
			lengthMs: 20_000,
			rearmMs: 40_000,
			notes: 'Two bursts of low mist, timed with the owl call track.',
			cues: [
				{ output: 'Fog machine', startMs: 0, action: { type: 'pulse', durationMs: 3000 } },
				{ output: 'Fog machine', startMs: 12_000, action: { type: 'pulse', durationMs: 3000 } }
			],
			responses: []
		}
	],
	'marrowfield-night-gallery': [
		{
			name: 'Bell jar lean',
			room: 'Echo Tunnel',
			trigger: 'sensor',
			triggerSensor: 'Lean sensor',
			lengthMs: 5000,
			rearmMs: 500,
			notes: 'The jar stays dim until a visitor leans past halfway, then glows fast.',
			cues: [],
			responses: [
				{
					sensor: 'Lean sensor',
					output: 'Jar glow',
					shape: 'points',
					points: [
						[0, 0.05],
						[0.5, 0.15],
						[0.8, 0.9],
						[1, 1]
					],
					minLevel: 0,
					maxLevel: 1
				}
			]
		}
	]
};

export async function seedDemoScenes(db: Db, venueId: string, slug: string, personId: string) {
	const list = DEMO_SCENES[slug];
	if (!list) return;
	const [roomRows, sensorRows, outputRows] = await Promise.all([
		db.select().from(rooms).where(eq(rooms.venueId, venueId)),
		db.select().from(sensors).where(eq(sensors.venueId, venueId)),
		db.select().from(outputs).where(eq(outputs.venueId, venueId))
	]);
	const sensorId = (name: string) => sensorRows.find((s) => s.name === name)?.id;
	const outputId = (name: string) => outputRows.find((o) => o.name === name)?.id;
	for (const s of list) {
		const [existing] = await db
			.select({ id: scenes.id })
			.from(scenes)
			.where(and(eq(scenes.venueId, venueId), eq(scenes.name, s.name)));
		if (existing) continue;
		const [row] = await db
			.insert(scenes)
			.values({
				venueId,
				name: s.name,
				roomId: roomRows.find((r) => r.name === s.room)?.id ?? null,
				trigger: s.trigger,
				triggerSensorId: s.triggerSensor ? (sensorId(s.triggerSensor) ?? null) : null,
				loopMs: s.loopMs ?? null,
				lengthMs: s.lengthMs,
				rearmMs: s.rearmMs,
				notes: s.notes
			})
			.returning();
		for (const c of s.cues) {
			const id = outputId(c.output);
			if (id)
				await db
					.insert(sceneCues)
					.values({ venueId, sceneId: row.id, outputId: id, startMs: c.startMs, action: c.action });
		}
		for (const r of s.responses) {
			const [sid, oid] = [sensorId(r.sensor), outputId(r.output)];
			if (sid && oid)
				await db.insert(sceneResponses).values({
					venueId,
					sceneId: row.id,
					sensorId: sid,
					outputId: oid,
					shape: r.shape,
					threshold: r.threshold ?? null,
					points: r.points ?? null,
					minLevel: r.minLevel,
					maxLevel: r.maxLevel
				});
		}
		await db
			.insert(sceneChanges)
			.values({ venueId, sceneId: row.id, personId, summary: 'Created the scene.', detail: {} });
	}
}
