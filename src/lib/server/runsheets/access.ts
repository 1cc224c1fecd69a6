import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { PLANNERS } from '$lib/server/auth/guard';
import type { VenueContext } from '$lib/server/auth/types';
import { db } from '$lib/server/db';
import { buildShowRunSheets } from './build';

/**
 * A show's run sheets as one person may see them: planners see everyone's, anyone else only
 * their own (and gets 403 when they are not on the show).
 */
export async function visibleRunSheets(
	venue: VenueContext,
	personId: string,
	showId: string,
	origin: string
) {
	if (!z.uuid().safeParse(showId).success) error(404, 'There is no such show.');
	const built = await buildShowRunSheets(db, venue.id, showId, origin);
	if (!built) error(404, 'There is no such show.');
	const planner = PLANNERS.includes(venue.role);
	if (planner) return { ...built, planner };
	const mine = built.sheets.filter((s) => s.personId === personId);
	if (!mine.length) error(403, 'You see run sheets of the shows you are assigned to.');
	return { ...built, sheets: mine, planner };
}
