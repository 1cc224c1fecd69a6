import { and, eq } from 'drizzle-orm';
import { signOffBlockers } from '$lib/checklists/view';
import type { Db } from '$lib/server/db/client';
import { props, signOffs, standDowns } from '$lib/server/db/schema';
import { isUniqueViolation } from '$lib/server/db/errors';
import { audit } from '$lib/server/audit';
import { notifyShow } from './live';
import { loadChecklist } from './state';
import { scenesForShow } from '$lib/server/scenes/for-show';

type Venue = { id: string; slug: string };

/** Stand a prop down for one night: its scenes hold their safe state. Permanent, audited. */
export async function standDown(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	input: { propId: string; reason: string }
): Promise<{ ok: true } | { ok: false; message: string }> {
	const [prop] = await db
		.select({ id: props.id, name: props.name })
		.from(props)
		.where(and(eq(props.id, input.propId), eq(props.venueId, venue.id)));
	if (!prop) return { ok: false, message: 'There is no such prop.' };
	const night = await scenesForShow(db, venue.id, showId);
	if (!night.some((s) => s.propIds.includes(prop.id)))
		return { ok: false, message: `${prop.name} is not in any of tonight's scenes.` };
	try {
		await db.insert(standDowns).values({
			venueId: venue.id,
			showId,
			propId: prop.id,
			reason: input.reason,
			personId
		});
	} catch (e) {
		if (isUniqueViolation(e))
			return { ok: false, message: `${prop.name} is already stood down for this night.` };
		throw e;
	}
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.prop_stood_down',
		detail: { show: showId, prop: prop.name, reason: input.reason }
	});
	await notifyShow(db, showId);
	return { ok: true };
}

/**
 * Sign the night off: allowed only when every required check passed or its prop is stood down.
 * The sign-off is permanent; the answer lists what still stands in the way.
 */
export async function signOff(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	note: string | null
): Promise<{ ok: true } | { ok: false; message: string; blockers: string[] }> {
	const state = await loadChecklist(db, venue, showId);
	if (state.signOff)
		return { ok: false, message: 'This night is already signed off.', blockers: [] };
	if (state.checks.length === 0)
		return { ok: false, message: 'There is no checklist for this night yet.', blockers: [] };
	const blockers = signOffBlockers(state.checks);
	if (blockers.length)
		return {
			ok: false,
			message: `Not yet: ${blockers.length} required ${blockers.length === 1 ? 'check has' : 'checks have'} not passed. Record them, or stand the failing prop down with a reason.`,
			blockers
		};
	try {
		await db.insert(signOffs).values({ venueId: venue.id, showId, personId, note });
	} catch (e) {
		if (isUniqueViolation(e))
			return { ok: false, message: 'This night is already signed off.', blockers: [] };
		throw e;
	}
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.signed_off',
		detail: {
			show: showId,
			checks: state.checks.length,
			stoodDown: state.standDowns.map((d) => d.propName),
			note
		}
	});
	await notifyShow(db, showId);
	return { ok: true };
}
