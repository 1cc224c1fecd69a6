import { and, asc, eq, inArray } from 'drizzle-orm';
import { expandSeason, type ShowNight } from '../../schedule';
import type { Db } from '../db/client';
import { seasons, shows } from '../db/schema';

export interface SeasonFields {
	name: string;
	firstNight: string;
	rule: string;
	doorsOpen: string;
	doorsClose: string;
	crewCallMinutesBefore: number;
	darkNights: string[];
	extraNights: string[];
	openingNight: string | null;
}

/** The nights a season would give, without saving anything. Throws SeasonRuleError on a bad rule. */
export function previewNights(fields: SeasonFields, timeZone: string): ShowNight[] {
	return expandSeason(
		{
			timeZone,
			firstNight: fields.firstNight,
			rule: fields.rule,
			doorsOpen: fields.doorsOpen,
			doorsClose: fields.doorsClose,
			crewCallMinutesBefore: fields.crewCallMinutesBefore,
			darkNights: fields.darkNights,
			extraNights: fields.extraNights
		},
		{ maxNights: 400 }
	);
}

export interface RegenerateResult {
	added: number;
	updated: number;
	removed: number;
	kept: number;
}

/**
 * Brings a season's stored shows in line with its rule. Shows changed by hand are left exactly as
 * they are; other shows are moved to the rule's times, added or removed.
 */
export async function regenerateShows(
	db: Db,
	venueId: string,
	seasonId: string,
	timeZone: string
): Promise<RegenerateResult> {
	return db.transaction(async (tx) => {
		const [season] = await tx
			.select()
			.from(seasons)
			.where(and(eq(seasons.id, seasonId), eq(seasons.venueId, venueId)))
			.for('update');
		if (!season) throw new Error('No such season in this venue.');
		const nights = previewNights(season, timeZone);
		const existing = await tx
			.select()
			.from(shows)
			.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)));
		const byDate = new Map(existing.map((s) => [s.date, s]));
		const wanted = new Set(nights.map((n) => n.date));
		const result: RegenerateResult = { added: 0, updated: 0, removed: 0, kept: 0 };

		const stale = existing.filter((s) => !s.edited && !wanted.has(s.date)).map((s) => s.id);
		if (stale.length) {
			await tx.delete(shows).where(and(eq(shows.venueId, venueId), inArray(shows.id, stale)));
			result.removed = stale.length;
		}
		for (const night of nights) {
			const opening = season.openingNight === night.date;
			const show = byDate.get(night.date);
			if (!show) {
				await tx.insert(shows).values({
					venueId,
					seasonId,
					date: night.date,
					doorsOpen: night.doorsOpen,
					doorsClose: night.doorsClose,
					crewCall: night.crewCall,
					openingNight: opening
				});
				result.added++;
			} else if (show.edited) {
				result.kept++;
				if (show.openingNight !== opening) {
					await tx.update(shows).set({ openingNight: opening }).where(eq(shows.id, show.id));
				}
			} else if (
				show.doorsOpen.getTime() !== night.doorsOpen.getTime() ||
				show.doorsClose.getTime() !== night.doorsClose.getTime() ||
				show.crewCall.getTime() !== night.crewCall.getTime() ||
				show.openingNight !== opening ||
				show.status !== 'scheduled'
			) {
				await tx
					.update(shows)
					.set({
						doorsOpen: night.doorsOpen,
						doorsClose: night.doorsClose,
						crewCall: night.crewCall,
						openingNight: opening,
						status: 'scheduled',
						sequence: show.sequence + 1
					})
					.where(eq(shows.id, show.id));
				result.updated++;
			}
		}
		// Edited shows whose date left the rule are kept as they are.
		result.kept += existing.filter((s) => s.edited && !wanted.has(s.date)).length;
		return result;
	});
}

export async function createSeason(
	db: Db,
	venueId: string,
	timeZone: string,
	fields: SeasonFields
) {
	const [season] = await db
		.insert(seasons)
		.values({ ...fields, venueId })
		.returning();
	const result = await regenerateShows(db, venueId, season.id, timeZone);
	return { season, result };
}

export async function updateSeason(
	db: Db,
	venueId: string,
	seasonId: string,
	timeZone: string,
	fields: SeasonFields
) {
	const done = await db
		.update(seasons)
		.set({ ...fields, updatedAt: new Date() })
		.where(and(eq(seasons.id, seasonId), eq(seasons.venueId, venueId)))
		.returning();
	if (!done.length) return null;
	return regenerateShows(db, venueId, seasonId, timeZone);
}

export function seasonShows(db: Db, venueId: string, seasonId: string) {
	return db
		.select()
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)))
		.orderBy(asc(shows.date));
}
