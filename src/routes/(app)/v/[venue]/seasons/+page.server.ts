import { error } from '@sveltejs/kit';
import { asc, count, eq } from 'drizzle-orm';
import { describeRule, SeasonRuleError } from '$lib/schedule';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { seasons, shows } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

function summary(rule: string) {
	try {
		return describeRule(rule);
	} catch (e) {
		if (e instanceof SeasonRuleError) return rule;
		throw e;
	}
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	if (venue.role === 'crew') error(403, 'Crew see their nights under My nights.');
	const list = await db
		.select({
			id: seasons.id,
			name: seasons.name,
			rule: seasons.rule,
			firstNight: seasons.firstNight,
			openingNight: seasons.openingNight,
			shows: count(shows.id)
		})
		.from(seasons)
		.leftJoin(shows, eq(shows.seasonId, seasons.id))
		.where(eq(seasons.venueId, venue.id))
		.groupBy(seasons.id)
		.orderBy(asc(seasons.firstNight));
	return {
		seasons: list.map((s) => ({ ...s, summary: summary(s.rule) })),
		canEdit: PLANNERS.includes(venue.role)
	};
};
