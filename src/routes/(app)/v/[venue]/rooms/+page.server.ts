import { fail } from '@sveltejs/kit';
import { and, asc, eq, max } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { uniqueErrors } from '$lib/server/db/errors';
import { rooms } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { roomIdSchema, roomSchema } from '$lib/schemas/room';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const list = await db
		.select()
		.from(rooms)
		.where(eq(rooms.venueId, venue.id))
		.orderBy(asc(rooms.position), asc(rooms.name));
	return { rooms: list, canEdit: EDITORS.includes(venue.role) };
};

export const actions: Actions = {
	add: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, roomSchema);
		if (!parsed.ok)
			return fail(400, { action: 'add', values: keep(parsed.raw), errors: parsed.errors });
		const [last] = await db
			.select({ p: max(rooms.position) })
			.from(rooms)
			.where(eq(rooms.venueId, venue.id));
		try {
			await db
				.insert(rooms)
				.values({ ...parsed.data, venueId: venue.id, position: (last?.p ?? 0) + 1 });
		} catch (e) {
			const errors = uniqueErrors(e);
			if (!errors) throw e;
			return fail(400, { action: 'add', values: keep(parsed.raw), errors });
		}
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'room.added',
			detail: { name: parsed.data.name }
		});
		return { action: 'add', saved: true };
	},
	rename: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, roomSchema.extend(roomIdSchema.shape));
		if (!parsed.ok)
			return fail(400, {
				action: 'rename',
				id: parsed.raw.id,
				values: keep(parsed.raw),
				errors: parsed.errors
			});
		const { id, ...values } = parsed.data;
		try {
			const done = await db
				.update(rooms)
				.set(values)
				.where(and(eq(rooms.id, id), eq(rooms.venueId, venue.id)))
				.returning();
			if (!done.length)
				return fail(404, { action: 'rename', id, message: 'That room no longer exists.' });
		} catch (e) {
			const errors = uniqueErrors(e);
			if (!errors) throw e;
			return fail(400, { action: 'rename', id, values: keep(parsed.raw), errors });
		}
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'room.changed',
			detail: { name: values.name }
		});
		return { action: 'rename', saved: true };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, roomIdSchema);
		if (!parsed.ok) return fail(400, { action: 'remove', message: 'That room does not exist.' });
		const done = await db
			.delete(rooms)
			.where(and(eq(rooms.id, parsed.data.id), eq(rooms.venueId, venue.id)))
			.returning();
		if (!done.length)
			return fail(404, { action: 'remove', message: 'That room no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'room.removed',
			detail: { name: done[0].name }
		});
		return { action: 'remove', saved: true };
	}
};
