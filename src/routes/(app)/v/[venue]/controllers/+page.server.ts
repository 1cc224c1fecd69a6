import { fail } from '@sveltejs/kit';
import { and, asc, eq, isNotNull, sql } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { controllers, props } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { venueControllers } from '$lib/server/props/queries';
import { issueKey, revokeKey, venueKeys } from '$lib/server/boards/keys';
import { controllerSchema } from '$lib/schemas/controller';
import { pwmFrequencyForBits } from '$lib/electronics';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

const idSchema = z.object({ id: z.uuid('That controller does not exist.') });
const keyIdSchema = z.object({ key: z.uuid('That key does not exist.') });

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const canEdit = EDITORS.includes(venue.role);
	const [list, uses, keys] = await Promise.all([
		venueControllers(db, venue.id),
		db
			.select({ id: props.controllerId, n: sql<number>`count(*)::int` })
			.from(props)
			.where(and(eq(props.venueId, venue.id), isNotNull(props.controllerId)))
			.groupBy(props.controllerId),
		// Keys are shown only to those who may make and revoke them (never the tokens).
		canEdit ? venueKeys(db, venue.id) : Promise.resolve([])
	]);
	const propCount = new Map(uses.map((u) => [u.id, u.n]));
	return {
		controllers: list.map((c) => {
			const f = pwmFrequencyForBits({
				clockHz: c.clockHz,
				prescaler: c.prescaler,
				bits: c.pwmBits
			});
			return {
				...c,
				pwmHz: f.ok ? f.value : null,
				propCount: propCount.get(c.id) ?? 0,
				keys: keys.filter((k) => k.controllerId === c.id)
			};
		}),
		timeZone: venue.timeZone,
		canEdit
	};
};

export const actions: Actions = {
	issueKey: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok) return fail(400, { message: 'That controller does not exist.' });
		const made = await issueKey(db, venue.id, parsed.data.id, event.locals.person!.id);
		if (!made) return fail(404, { message: 'That controller no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'board_key.issued',
			detail: { controller: made.controller.name, hint: made.hint }
		});
		// The only time the token leaves the server.
		return { newKey: { controllerId: parsed.data.id, token: made.token } };
	},
	revokeKey: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, keyIdSchema);
		if (!parsed.ok) return fail(400, { message: 'That key does not exist.' });
		const done = await revokeKey(db, venue.id, parsed.data.key);
		if (!done) return fail(404, { message: 'That key no longer exists or is already revoked.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'board_key.revoked',
			detail: { key: done.id }
		});
		return { revoked: true };
	},
	add: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, controllerSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		await db.insert(controllers).values({ ...parsed.data, venueId: venue.id });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'controller.added',
			detail: { name: parsed.data.name }
		});
		return { saved: true };
	},
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, controllerSchema.and(idSchema));
		const id = typeof parsed.raw.id === 'string' ? parsed.raw.id : '';
		if (!parsed.ok)
			return fail(400, { editing: id, values: keep(parsed.raw), errors: parsed.errors });
		const { id: _id, ...values } = parsed.data;
		const done = await db
			.update(controllers)
			.set(values)
			.where(and(eq(controllers.id, parsed.data.id), eq(controllers.venueId, venue.id)))
			.returning({ id: controllers.id });
		if (!done.length) return fail(404, { message: 'That controller no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'controller.changed',
			detail: { name: values.name }
		});
		return { saved: true, changed: values.name };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(
			event.request,
			idSchema.extend({ detach: z.preprocess((v) => v === 'on', z.boolean()) })
		);
		if (!parsed.ok) return fail(400, { message: 'That controller does not exist.' });
		const result = await db.transaction(async (tx) => {
			const [c] = await tx
				.select({ id: controllers.id, name: controllers.name })
				.from(controllers)
				.where(and(eq(controllers.id, parsed.data.id), eq(controllers.venueId, venue.id)))
				.for('update');
			if (!c) return { gone: true as const };
			const using = await tx
				.select({ name: props.name })
				.from(props)
				.where(and(eq(props.venueId, venue.id), eq(props.controllerId, c.id)))
				.orderBy(asc(props.name));
			if (using.length && !parsed.data.detach) return { c, using };
			// The props keep everything else; their controller becomes none (ON DELETE SET NULL).
			await tx.delete(controllers).where(eq(controllers.id, c.id));
			return { c, using, removed: true as const };
		});
		if ('gone' in result) return fail(404, { message: 'That controller no longer exists.' });
		if (!('removed' in result)) {
			const names = result.using.map((u) => u.name);
			const shown =
				names.length > 3
					? `${names.slice(0, 3).join(', ')} and ${names.length - 3} more`
					: names.join(', ');
			return fail(409, {
				blocked: result.c.id,
				message: `${result.c.name} is still used by ${names.length === 1 ? 'a prop' : `${names.length} props`} (${shown}). Move ${names.length === 1 ? 'it' : 'them'} to another controller first, or tick “Set ${names.length === 1 ? 'its prop' : 'its props'} to no controller” and remove again.`
			});
		}
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'controller.removed',
			detail: { name: result.c.name, propsSetToNone: result.using.length }
		});
		return { removed: true };
	}
};
