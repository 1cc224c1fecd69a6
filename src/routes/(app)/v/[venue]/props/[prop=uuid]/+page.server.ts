import { error, fail, redirect } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { env } from '$env/dynamic/private';
import { outputs, props, sensors } from '$lib/server/db/schema';
import { objectStore } from '$lib/server/objects';
import { discardObjects } from '$lib/server/object-cleanup';
import { removeProp, removePropFile, removeSensor } from '$lib/server/props/removal';
import { keep, parseForm } from '$lib/server/forms';
import { parseNestedForm } from '$lib/server/props/form';
import { getProp, ownsRefs, venueControllers, venueRooms } from '$lib/server/props/queries';
import { outputValues, propChildren, sensorValues, touchProp } from '$lib/server/props/records';
import { hazardsOf } from '$lib/props/output-maths';
import { scenesUsingOutputs } from '$lib/server/scenes/records';
import { listFaults } from '$lib/server/faults/records';
import { maintenanceWorkItems } from '$lib/server/wear/records';
import { propSchema } from '$lib/schemas/prop';
import { sensorSchema } from '$lib/schemas/sensor';
import { outputSchema } from '$lib/schemas/output';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) error(404, 'There is no such prop in this venue.');
	const [children, rooms, controllers, openFaults] = await Promise.all([
		propChildren(db, venue.id, prop.id),
		venueRooms(db, venue.id),
		venueControllers(db, venue.id),
		listFaults(db, venue.id, { propId: prop.id, openOnly: true })
	]);
	const controller = controllers.find((c) => c.id === prop.controllerId) ?? null;
	const hazards = [...new Set(children.outputs.flatMap((o) => hazardsOf(o)))];
	const [usedIn, maintenance] = await Promise.all([
		scenesUsingOutputs(
			db,
			venue.id,
			children.outputs.map((o) => o.id)
		),
		maintenanceWorkItems(
			db,
			venue.id,
			children.outputs.map((o) => o.id)
		)
	]);
	return {
		prop,
		...children,
		// Object keys stay on the server: the page links files by id.
		files: children.files.map(({ objectKey: _key, ...f }) => f),
		hazards,
		usedIn,
		rooms,
		controllers: controllers.map((c) => ({ id: c.id, name: c.name })),
		controller,
		roomName: rooms.find((r) => r.id === prop.roomId)?.name ?? null,
		canEdit: EDITORS.includes(venue.role),
		openFaults: openFaults.map(({ events: _events, ...f }) => f),
		maintenance
	};
};

async function editableProp(event: RequestEvent, venue: { id: string }) {
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) error(404, 'There is no such prop in this venue.');
	return prop;
}

const idSchema = z.object({ id: z.uuid() });

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseForm(event.request, propSchema);
		if (!parsed.ok)
			return fail(400, { action: 'save', values: keep(parsed.raw), errors: parsed.errors });
		const refErrors = await ownsRefs(db, venue.id, parsed.data);
		if (Object.keys(refErrors).length)
			return fail(400, { action: 'save', values: keep(parsed.raw), errors: refErrors });
		await db
			.update(props)
			.set({ ...parsed.data, updatedAt: new Date() })
			.where(and(eq(props.id, prop.id), eq(props.venueId, venue.id)));
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'prop.changed',
			detail: { name: parsed.data.name }
		});
		return { action: 'save', saved: true };
	},
	addSensor: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseNestedForm(event.request, sensorSchema);
		if (!parsed.ok)
			return fail(400, { action: 'addSensor', values: parsed.raw, errors: parsed.errors });
		await db
			.insert(sensors)
			.values({ ...sensorValues(parsed.data), venueId: venue.id, propId: prop.id });
		await touchProp(db, venue.id, prop.id);
		return { action: 'addSensor', saved: true };
	},
	addOutput: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseNestedForm(event.request, outputSchema);
		if (!parsed.ok)
			return fail(400, { action: 'addOutput', values: parsed.raw, errors: parsed.errors });
		const values = outputValues(parsed.data);
		await db.insert(outputs).values({
			...values,
			curve: values.kind === 'led_string' ? { kind: 'cie' } : null,
			venueId: venue.id,
			propId: prop.id
		});
		await touchProp(db, venue.id, prop.id);
		return { action: 'addOutput', saved: true };
	},
	removeSensor: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok) return fail(400, { message: 'That sensor does not exist.' });
		const removal = await removeSensor(db, venue.id, prop.id, parsed.data.id);
		if (!removal.removed) return fail(404, { message: 'That sensor was already removed.' });
		await discardObjects(objectStore(env), removal.keys);
		return { removed: true };
	},
	removeOutput: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok) return fail(400, { message: 'That output does not exist.' });
		const done = await db
			.delete(outputs)
			.where(
				and(
					eq(outputs.id, parsed.data.id),
					eq(outputs.venueId, venue.id),
					eq(outputs.propId, prop.id)
				)
			)
			.returning({ id: outputs.id });
		if (!done.length) return fail(404, { message: 'That output was already removed.' });
		return { removed: true };
	},
	removeFile: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok) return fail(400, { message: 'That file does not exist.' });
		const removal = await removePropFile(db, venue.id, prop.id, parsed.data.id);
		if (!removal.removed) return fail(404, { message: 'That file was already removed.' });
		await discardObjects(objectStore(env), removal.keys);
		return { removed: true };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await editableProp(event, venue);
		const removal = await removeProp(db, venue.id, prop.id);
		if (!removal.removed) return fail(404, { message: 'That prop was already removed.' });
		await discardObjects(objectStore(env), removal.keys);
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'prop.removed',
			detail: { name: prop.name }
		});
		redirect(303, `/v/${venue.slug}/props`);
	}
};
