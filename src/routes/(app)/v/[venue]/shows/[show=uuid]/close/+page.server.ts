import { error, fail } from '@sveltejs/kit';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { freshClose, signClose, tickClose } from '$lib/server/checklists/close';
import { parseForm, keep } from '$lib/server/forms';
import { closeSignSchema, closeTickSchema } from '$lib/schemas/wear';
import type { Actions, PageServerLoad } from './$types';

const HAZARDS: Record<string, string> = { fog: 'fog', air: 'pneumatics', strobe: 'strobes' };

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const state = await freshClose(db, venue.id, access.show.id);
	return {
		show: { id: access.show.id, date: access.show.date },
		lines: state.lines.map((l) => ({ ...l, at: l.at?.toISOString() ?? null })),
		signed: state.signed ? { ...state.signed, at: state.signed.at.toISOString() } : null,
		ready: state.ready,
		canSign: access.manages,
		hazards: [...new Set(state.lines.flatMap((l) => (HAZARDS[l.kind] ? [HAZARDS[l.kind]] : [])))]
	};
};

export const actions: Actions = {
	tick: async (event) => {
		const venue = requireRole(event);
		const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
		if (!access.ok) error(access.status, access.message);
		const parsed = await parseForm(event.request, closeTickSchema);
		if (!parsed.ok)
			return fail(400, { action: 'tick', values: keep(parsed.raw), errors: parsed.errors });
		const done = await tickClose(
			db,
			venue.id,
			access.show.id,
			event.locals.person!.id,
			parsed.data.line,
			parsed.data.outcome === 'pass',
			parsed.data.note
		);
		if (!done.ok)
			return fail(done.status, {
				action: 'tick',
				line: parsed.data.line,
				values: keep(parsed.raw),
				message: done.message
			});
		return { action: 'tick', saved: true };
	},
	sign: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
		if (!access.ok) error(access.status, access.message);
		const parsed = await parseForm(event.request, closeSignSchema);
		if (!parsed.ok)
			return fail(400, { action: 'sign', values: keep(parsed.raw), errors: parsed.errors });
		const done = await signClose(
			db,
			venue.id,
			access.show.id,
			event.locals.person!.id,
			parsed.data.note
		);
		if (!done.ok)
			return fail(done.status, { action: 'sign', values: keep(parsed.raw), message: done.message });
		return { action: 'sign', saved: true };
	}
};
