import {
	bigint,
	boolean,
	date,
	index,
	integer,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { rooms, venues } from './venues.schema';

export const SHOW_STATUSES = ['scheduled', 'cancelled', 'dark'] as const;
export const showStatus = pgEnum('show_status', SHOW_STATUSES);

export const seasons = pgTable(
	'seasons',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		firstNight: date('first_night').notNull(),
		/** RFC 5545 RRULE text, without DTSTART. */
		rule: text('rule').notNull(),
		/** Local wall times 'HH:MM' in the venue's time zone. */
		doorsOpen: text('doors_open').notNull(),
		doorsClose: text('doors_close').notNull(),
		crewCallMinutesBefore: integer('crew_call_minutes_before').notNull(),
		darkNights: date('dark_nights').array().notNull().default([]),
		extraNights: date('extra_nights').array().notNull().default([]),
		openingNight: date('opening_night'),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('seasons_venue').on(t.venueId)]
);

export const shows = pgTable(
	'shows',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		/** Null for a one-off show outside any season. */
		seasonId: uuid('season_id').references(() => seasons.id, { onDelete: 'cascade' }),
		/** The venue's local date of the night. */
		date: date('date').notNull(),
		doorsOpen: timestamp('doors_open', { withTimezone: true }).notNull(),
		doorsClose: timestamp('doors_close', { withTimezone: true }).notNull(),
		crewCall: timestamp('crew_call', { withTimezone: true }).notNull(),
		status: showStatus('status').notNull().default('scheduled'),
		openingNight: boolean('opening_night').notNull().default(false),
		/** Changed by hand: regenerating the season leaves this show as it is. */
		edited: boolean('edited').notNull().default(false),
		editedAt: timestamp('edited_at', { withTimezone: true }),
		editedBy: text('edited_by').references(() => users.id, { onDelete: 'set null' }),
		notes: text('notes'),
		/** Raised on every change so calendar programs replace their copy (RFC 5545 SEQUENCE). */
		sequence: integer('sequence').notNull().default(0),
		/**
		 * The venue's checklist-inputs number this show's checklist was generated at; null when it
		 * has none yet or the scenes left out of it changed.
		 */
		checklistVersion: bigint('checklist_version', { mode: 'number' }),
		/**
		 * Raised (by triggers) on every write to the show's checks, results, stand-downs, restores and
		 * sign-off: a copy of the checklist read at one number is still right at the same number.
		 */
		checklistActivity: bigint('checklist_activity', { mode: 'number' }).notNull().default(0),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
		// The scenes that run on a night are linked by a show_scenes table once scenes exist.
	},
	(t) => [
		index('shows_venue_date').on(t.venueId, t.date),
		uniqueIndex('shows_season_date').on(t.seasonId, t.date)
	]
);

export const positions = pgTable(
	'positions',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		required: boolean('required').notNull().default(true),
		/** A safety post gets every room's hazards and the venue's safety items on its run sheet. */
		safetyPost: boolean('safety_post').notNull().default(false),
		/** People the post needs each night. */
		headcount: integer('headcount').notNull().default(1),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('positions_venue_name').on(t.venueId, t.name)]
);

export const assignments = pgTable(
	'assignments',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		showId: uuid('show_id')
			.notNull()
			.references(() => shows.id, { onDelete: 'cascade' }),
		positionId: uuid('position_id')
			.notNull()
			.references(() => positions.id, { onDelete: 'cascade' }),
		personId: text('person_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		/** A call time for this person only; null means the show's crew call. */
		callOverride: timestamp('call_override', { withTimezone: true }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		uniqueIndex('assignments_show_position_person').on(t.showId, t.positionId, t.personId),
		index('assignments_person').on(t.personId),
		index('assignments_venue').on(t.venueId)
	]
);

export const unavailability = pgTable(
	'unavailability',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		personId: text('person_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		date: date('date').notNull(),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('unavailability_venue_person_date').on(t.venueId, t.personId, t.date)]
);

export const FEED_KINDS = ['person', 'venue'] as const;
export const feedKind = pgEnum('feed_kind', FEED_KINDS);

export const calendarFeeds = pgTable(
	'calendar_feeds',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		kind: feedKind('kind').notNull(),
		/** The person who owns the link; a venue feed is also owned by the person who made it. */
		personId: text('person_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		venueId: uuid('venue_id').references(() => venues.id, { onDelete: 'cascade' }),
		/** SHA-256 of the token in the link; the token itself is shown once. */
		tokenHash: text('token_hash').notNull().unique(),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
		resetAt: timestamp('reset_at', { withTimezone: true })
	},
	(t) => [index('calendar_feeds_person').on(t.personId)]
);
