import { and, asc, eq, gte, inArray, lte, sql } from 'drizzle-orm';
import { expandSeason, type ShowNight } from '../../schedule';
import type { Db } from '../db/client';
import { assignments, seasons, shows } from '../db/schema';

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
	/**
	 * Untouched shows that left the rule but stay: crew are assigned, checks were recorded, or
	 * removal was not confirmed.
	 */
	stayed: number;
	/** The dates among those that stay because checks or incidents were recorded on them (history is kept). */
	recorded: string[];
}

/** Which untouched shows that left the rule may go; the rest stay as they are. */
export interface RemovalChoice {
	/** Dates the manager confirmed removing ('all' when nothing needs asking, e.g. a new season). */
	confirmed: 'all' | Set<string>;
	/** Remove nights that have crew assigned too (their assignments go with them). */
	assigned: boolean;
}

export interface LeavingShow {
	id: string;
	date: string;
	assignments: number;
	/** Check results, sign-offs, stand-downs and incidents recorded on the night: such a night always stays. */
	results: number;
}

/**
 * How many history rows (results, sign-off, stand-downs) a show has. Written out in full: Drizzle
 * leaves column names unqualified in a one-table select, which would tie the inner tables to
 * themselves.
 */
const history = sql<number>`((select count(*) from check_results h where h.show_id = "shows"."id")
	+ (select count(*) from sign_offs h where h.show_id = "shows"."id")
	+ (select count(*) from stand_downs h where h.show_id = "shows"."id")
	+ (select count(*) from incidents h where h.show_id = "shows"."id"))::int`;

type Reader = Pick<Db, 'select'>;

/**
 * Untouched shows of a season whose dates are not among these nights: what saving would remove.
 * Shows changed by hand are never removed, so they are not listed.
 */
export async function leavingShows(
	db: Reader,
	venueId: string,
	seasonId: string,
	nights: Pick<ShowNight, 'date'>[]
): Promise<LeavingShow[]> {
	const wanted = new Set(nights.map((n) => n.date));
	const rows = await db
		.select({
			id: shows.id,
			date: shows.date,
			assignments: sql<number>`count(${assignments.id})::int`,
			results: history
		})
		.from(shows)
		.leftJoin(assignments, eq(assignments.showId, shows.id))
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId), eq(shows.edited, false)))
		.groupBy(shows.id)
		.orderBy(asc(shows.date));
	return rows.filter((r) => !wanted.has(r.date));
}

export interface OverlappingNight {
	date: string;
	/** The other season's name; null for a one-off show. */
	seasonName: string | null;
}

/**
 * Nights of these that clash with another season's (or a one-off) show of the venue: the same
 * date with doors times that overlap. Dark and cancelled shows do not clash.
 */
export async function overlappingNights(
	db: Reader,
	venueId: string,
	nights: Pick<ShowNight, 'date' | 'doorsOpen' | 'doorsClose'>[],
	exceptSeasonId?: string
): Promise<OverlappingNight[]> {
	if (!nights.length) return [];
	const dates = nights.map((n) => n.date).sort();
	const rows = await db
		.select({
			date: shows.date,
			doorsOpen: shows.doorsOpen,
			doorsClose: shows.doorsClose,
			seasonId: shows.seasonId,
			seasonName: seasons.name
		})
		.from(shows)
		.leftJoin(seasons, eq(seasons.id, shows.seasonId))
		.where(
			and(
				eq(shows.venueId, venueId),
				eq(shows.status, 'scheduled'),
				// The season's span, however many nights: two parameters, matched night by night below.
				gte(shows.date, dates[0]),
				lte(shows.date, dates[dates.length - 1])
			)
		)
		.orderBy(asc(shows.date));
	const byDate = new Map(nights.map((n) => [n.date, n]));
	const found: OverlappingNight[] = [];
	for (const r of rows) {
		if (exceptSeasonId && r.seasonId === exceptSeasonId) continue;
		const n = byDate.get(r.date);
		if (!n || !(r.doorsOpen < n.doorsClose && n.doorsOpen < r.doorsClose)) continue;
		found.push({ date: r.date, seasonName: r.seasonName });
	}
	return found;
}

/** The leaving shows that a choice removes. A night with recorded checks is never removed. */
export function removedBy(leaving: LeavingShow[], choice: RemovalChoice) {
	return leaving.filter(
		(s) =>
			s.results === 0 &&
			(choice.assigned || s.assignments === 0) &&
			(choice.confirmed === 'all' || choice.confirmed.has(s.date))
	);
}

/**
 * Brings a season's stored shows in line with its rule. Shows changed by hand are left exactly as
 * they are; other shows are moved to the rule's times, added or removed.
 */
export async function regenerateShows(
	db: Db,
	venueId: string,
	seasonId: string,
	timeZone: string,
	removal: RemovalChoice = { confirmed: 'all', assigned: false }
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
		const result: RegenerateResult = {
			added: 0,
			updated: 0,
			removed: 0,
			kept: 0,
			stayed: 0,
			recorded: []
		};

		const leaving = await leavingShows(tx, venueId, seasonId, nights);
		const stale = removedBy(leaving, removal).map((s) => s.id);
		if (stale.length) {
			await tx.delete(shows).where(and(eq(shows.venueId, venueId), inArray(shows.id, stale)));
			result.removed = stale.length;
		}
		result.stayed = leaving.length - stale.length;
		result.recorded = leaving.filter((s) => s.results > 0).map((s) => s.date);
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
	fields: SeasonFields,
	removal?: RemovalChoice
) {
	const done = await db
		.update(seasons)
		.set({ ...fields, updatedAt: new Date() })
		.where(and(eq(seasons.id, seasonId), eq(seasons.venueId, venueId)))
		.returning();
	if (!done.length) return null;
	return regenerateShows(db, venueId, seasonId, timeZone, removal);
}

/** The dates of a season's nights that have recorded checks, sign-offs or stand-downs. */
export async function recordedNights(db: Reader, venueId: string, seasonId: string) {
	const rows = await db
		.select({ date: shows.date, results: history })
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)))
		.orderBy(asc(shows.date));
	return rows.filter((r) => r.results > 0).map((r) => r.date);
}

export function seasonShows(db: Db, venueId: string, seasonId: string) {
	return db
		.select()
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)))
		.orderBy(asc(shows.date));
}
