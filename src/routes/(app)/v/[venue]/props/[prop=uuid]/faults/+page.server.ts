import { error, fail, redirect } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { checks } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { getProp, venueRooms } from '$lib/server/props/queries';
import {
	closeFault,
	listFaults,
	repairFault,
	reportFault,
	retestFault,
	type FaultOutcome
} from '$lib/server/faults/records';
import {
	faultCloseSchema,
	faultRepairSchema,
	faultReportSchema,
	faultRetestSchema
} from '$lib/schemas/fault';
import type { Role } from '$lib/roles';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** Who may close a fault: designers, show managers and owners. */
const CLOSERS: Role[] = ['owner', 'designer', 'show_manager'];

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) error(404, 'There is no such prop in this venue.');
	const [list, rooms] = await Promise.all([
		listFaults(db, venue.id, { propId: prop.id }),
		venueRooms(db, venue.id)
	]);
	// Reported from a failed check: the check's label and night come with the form.
	const asked = event.url.searchParams.get('check');
	let from: { checkId: string; showId: string; label: string } | null = null;
	if (asked && /^[0-9a-f-]{36}$/i.test(asked)) {
		const [check] = await db
			.select({ id: checks.id, showId: checks.showId, label: checks.label })
			.from(checks)
			.where(and(eq(checks.id, asked), eq(checks.venueId, venue.id), eq(checks.propId, prop.id)));
		if (check) from = { checkId: check.id, showId: check.showId, label: check.label };
	}
	return {
		prop: { id: prop.id, name: prop.name, roomId: prop.roomId },
		faults: list,
		rooms: rooms.map((r) => ({ id: r.id, name: r.name })),
		from,
		canRepair: EDITORS.includes(venue.role),
		canClose: CLOSERS.includes(venue.role)
	};
};

function answer(outcome: FaultOutcome, raw: Record<string, unknown>, event: RequestEvent) {
	if (!outcome.ok)
		return fail(outcome.status, {
			values: keep(raw),
			errors: { [outcome.field]: [outcome.message] },
			message: outcome.message
		});
	redirect(303, `${event.url.pathname}#fault-${outcome.id}`);
}

async function propOf(event: RequestEvent, venueId: string) {
	const prop = await getProp(db, venueId, event.params.prop);
	if (!prop) error(404, 'There is no such prop in this venue.');
	return prop;
}

export const actions: Actions = {
	report: async (event) => {
		const venue = requireRole(event);
		const prop = await propOf(event, venue.id);
		const parsed = await parseForm(event.request, faultReportSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await reportFault(db, venue.id, event.locals.person!.id, prop.id, parsed.data);
		return answer(done, parsed.raw, event);
	},
	repair: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const prop = await propOf(event, venue.id);
		const parsed = await parseForm(event.request, faultRepairSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await repairFault(db, venue.id, event.locals.person!.id, prop.id, parsed.data);
		return answer(done, parsed.raw, event);
	},
	retest: async (event) => {
		const venue = requireRole(event);
		const prop = await propOf(event, venue.id);
		const parsed = await parseForm(event.request, faultRetestSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await retestFault(db, venue.id, event.locals.person!.id, prop.id, parsed.data);
		return answer(done, parsed.raw, event);
	},
	close: async (event) => {
		const venue = requireRole(event, ...CLOSERS);
		const prop = await propOf(event, venue.id);
		const parsed = await parseForm(event.request, faultCloseSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await closeFault(db, venue.id, event.locals.person!.id, prop.id, parsed.data);
		return answer(done, parsed.raw, event);
	}
};
