import { error, fail } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { uniqueErrors } from '$lib/server/db/errors';
import { positions, rooms } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { listPositions } from '$lib/server/schedule/shows';
import { idSchema, positionEditSchema, positionSchema } from '$lib/schemas/schedule';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	if (venue.role === 'crew') error(403, 'Crew see their positions under My nights.');
	const roomList = await db
		.select({ id: rooms.id, name: rooms.name })
		.from(rooms)
		.where(eq(rooms.venueId, venue.id))
		.orderBy(asc(rooms.position), asc(rooms.name));
	return {
		positions: await listPositions(db, venue.id),
		rooms: roomList,
		canEdit: PLANNERS.includes(venue.role)
	};
};

async function roomOfVenue(venueId: string, roomId: string | null) {
	if (!roomId) return true;
	const [room] = await db
		.select({ id: rooms.id })
		.from(rooms)
		.where(and(eq(rooms.id, roomId), eq(rooms.venueId, venueId)));
	return !!room;
}

export const actions: Actions = {
	add: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, positionSchema);
		if (!parsed.ok)
			return fail(400, { action: 'add', values: keep(parsed.raw), errors: parsed.errors });
		if (!(await roomOfVenue(venue.id, parsed.data.roomId)))
			return fail(400, {
				action: 'add',
				values: keep(parsed.raw),
				errors: { roomId: ['Pick a room from the list.'] }
			});
		try {
			await db.insert(positions).values({ ...parsed.data, venueId: venue.id });
		} catch (e) {
			const errors = uniqueErrors(e);
			if (!errors) throw e;
			return fail(400, { action: 'add', values: keep(parsed.raw), errors });
		}
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'position.added',
			detail: { name: parsed.data.name }
		});
		return { action: 'add', saved: true };
	},
	edit: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, positionEditSchema);
		const id = typeof parsed.raw.id === 'string' ? parsed.raw.id : '';
		if (!parsed.ok)
			return fail(400, { action: 'edit', id, values: keep(parsed.raw), errors: parsed.errors });
		const { id: _id, ...fields } = parsed.data;
		if (!(await roomOfVenue(venue.id, fields.roomId)))
			return fail(400, {
				action: 'edit',
				id,
				values: keep(parsed.raw),
				errors: { roomId: ['Pick a room from the list.'] }
			});
		let before: (typeof positions.$inferSelect)[];
		let done: (typeof positions.$inferSelect)[];
		try {
			[before, done] = await db.transaction(async (tx) => {
				const old = await tx
					.select()
					.from(positions)
					.where(and(eq(positions.id, parsed.data.id), eq(positions.venueId, venue.id)))
					.for('update');
				if (!old.length) return [[], []];
				const changed = await tx
					.update(positions)
					.set(fields)
					.where(and(eq(positions.id, parsed.data.id), eq(positions.venueId, venue.id)))
					.returning();
				return [old, changed];
			});
		} catch (e) {
			const errors = uniqueErrors(e);
			if (!errors) throw e;
			return fail(400, { action: 'edit', id, values: keep(parsed.raw), errors });
		}
		if (!done.length)
			return fail(404, { action: 'edit', id, message: 'That position no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'position.changed',
			detail: {
				name: done[0].name,
				...(before[0].name !== done[0].name ? { was: before[0].name } : {})
			}
		});
		return { action: 'edit', id, saved: true };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok)
			return fail(400, { action: 'remove', message: 'That position does not exist.' });
		const done = await db
			.delete(positions)
			.where(and(eq(positions.id, parsed.data.id), eq(positions.venueId, venue.id)))
			.returning();
		if (!done.length)
			return fail(404, { action: 'remove', message: 'That position no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'position.removed',
			detail: { name: done[0].name }
		});
		return { action: 'remove', saved: true };
	}
};
