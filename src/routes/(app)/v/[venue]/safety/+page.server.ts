import { fail } from '@sveltejs/kit';
import { and, eq, max } from 'drizzle-orm';
import { z } from 'zod';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { venueSafetyItems } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { venueItems } from '$lib/server/checklists/sync';
import { safetyItemSchema } from '$lib/schemas/checklist';
import type { Actions, PageServerLoad } from './$types';

const idSchema = z.object({ id: z.uuid({ error: 'That item no longer exists.' }) });
const moveSchema = idSchema.extend({ direction: z.enum(['up', 'down']) });

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, ...PLANNERS);
	const items = await venueItems(db, venue.id, true);
	return {
		active: items.filter((i) => i.active).map((i) => ({ id: i.id, label: i.label })),
		retired: items.filter((i) => !i.active).map((i) => ({ id: i.id, label: i.label }))
	};
};

async function item(venueId: string, id: string) {
	const [row] = await db
		.select()
		.from(venueSafetyItems)
		.where(and(eq(venueSafetyItems.id, id), eq(venueSafetyItems.venueId, venueId)));
	return row ?? null;
}

export const actions: Actions = {
	add: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, safetyItemSchema);
		if (!parsed.ok)
			return fail(400, { action: 'add', values: keep(parsed.raw), errors: parsed.errors });
		await venueItems(db, venue.id);
		const [{ top }] = await db
			.select({ top: max(venueSafetyItems.position) })
			.from(venueSafetyItems)
			.where(eq(venueSafetyItems.venueId, venue.id));
		await db
			.insert(venueSafetyItems)
			.values({ venueId: venue.id, label: parsed.data.label, position: (top ?? 0) + 1 });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'safety_item.added',
			detail: { label: parsed.data.label }
		});
		return { action: 'add', saved: true };
	},
	retire: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, idSchema);
		const row = parsed.ok ? await item(venue.id, parsed.data.id) : null;
		if (!row) return fail(404, { action: 'retire', message: 'That item no longer exists.' });
		await db.update(venueSafetyItems).set({ active: false }).where(eq(venueSafetyItems.id, row.id));
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'safety_item.retired',
			detail: { label: row.label }
		});
		return { action: 'retire', saved: true };
	},
	restore: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, idSchema);
		const row = parsed.ok ? await item(venue.id, parsed.data.id) : null;
		if (!row) return fail(404, { action: 'restore', message: 'That item no longer exists.' });
		await db.update(venueSafetyItems).set({ active: true }).where(eq(venueSafetyItems.id, row.id));
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'safety_item.restored',
			detail: { label: row.label }
		});
		return { action: 'restore', saved: true };
	},
	move: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, moveSchema);
		if (!parsed.ok) return fail(400, { action: 'move', message: 'That item no longer exists.' });
		const list = (await venueItems(db, venue.id)).map((i) => i.id);
		const at = list.indexOf(parsed.data.id);
		const to = parsed.data.direction === 'up' ? at - 1 : at + 1;
		if (at < 0 || to < 0 || to >= list.length) return { action: 'move', saved: false };
		[list[at], list[to]] = [list[to], list[at]];
		await db.transaction(async (tx) => {
			for (const [i, id] of list.entries())
				await tx
					.update(venueSafetyItems)
					.set({ position: i + 1 })
					.where(and(eq(venueSafetyItems.id, id), eq(venueSafetyItems.venueId, venue.id)));
		});
		return { action: 'move', saved: true };
	}
};
