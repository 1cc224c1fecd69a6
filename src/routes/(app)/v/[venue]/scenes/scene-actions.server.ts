import { error, fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { outputs, props, sensors } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { loadScene } from '$lib/server/scenes/model';
import { NameTaken, createScene, duplicateScene } from '$lib/server/scenes/records';

const idSchema = z.object({ id: z.uuid('That scene does not exist.') });

/** Copies a scene and opens the copy. */
export async function duplicateAction(event: RequestEvent) {
	const venue = requireRole(event, ...EDITORS);
	const parsed = await parseForm(event.request, idSchema);
	if (!parsed.ok) return fail(400, { message: 'That scene does not exist.' });
	const loaded = await loadScene(db, venue.id, parsed.data.id);
	if (!loaded) error(404, 'There is no such scene in this venue.');
	const copy = await duplicateScene(db, venue.id, event.locals.person!.id, loaded);
	redirect(303, `/v/${venue.slug}/scenes/${copy.id}`);
}

const brightenSchema = z.object({
	sensorId: z.uuid('Choose a sensor.'),
	outputId: z.uuid('Choose an output.')
});

/**
 * "Brighten with depth": a scene in the prop's room, started by the sensor, whose response raises
 * the output as the depth grows. Opens the new scene.
 */
export async function brightenAction(event: RequestEvent) {
	const venue = requireRole(event, ...EDITORS);
	const parsed = await parseForm(event.request, brightenSchema);
	if (!parsed.ok) return fail(400, { message: 'Choose a sensor and an output of this prop.' });
	const [sensor] = await db
		.select()
		.from(sensors)
		.where(and(eq(sensors.id, parsed.data.sensorId), eq(sensors.venueId, venue.id)));
	const [output] = await db
		.select()
		.from(outputs)
		.where(and(eq(outputs.id, parsed.data.outputId), eq(outputs.venueId, venue.id)));
	if (!sensor || !output)
		return fail(400, { message: 'Choose a sensor and an output of this prop.' });
	const [prop] = await db
		.select()
		.from(props)
		.where(and(eq(props.id, sensor.propId), eq(props.venueId, venue.id)));
	const base = `${prop?.name ?? sensor.name}: ${output.name} with depth`;
	let scene;
	for (let i = 1; !scene; i++) {
		try {
			scene = await createScene(
				db,
				venue.id,
				event.locals.person!.id,
				{
					name: i === 1 ? base : `${base} ${i}`,
					roomId: prop?.roomId ?? null,
					trigger: 'sensor',
					triggerSensorId: sensor.id,
					loopMs: null,
					lengthMs: 10_000,
					rearmMs: sensor.rearmMs,
					runsOnShowNights: true,
					notes: null
				},
				{
					cues: [],
					responses: [
						{
							sensorId: sensor.id,
							outputId: output.id,
							shape: 'rise',
							threshold: null,
							points: null,
							minLevel: 0,
							maxLevel: 1
						}
					]
				},
				`Created from '${prop?.name ?? sensor.name}': ${output.name} rises with ${sensor.name}'s depth.`
			);
		} catch (e) {
			if (!(e instanceof NameTaken) || i > 20) throw e;
		}
	}
	redirect(303, `/v/${venue.slug}/scenes/${scene.id}`);
}
