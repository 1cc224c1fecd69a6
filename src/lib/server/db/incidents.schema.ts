import { sql } from 'drizzle-orm';
import {
	boolean,
	check,
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
import { rooms } from './venues.schema';
import { shows } from './schedule.schema';
import { INCIDENT_EVENT_KINDS, INCIDENT_KINDS } from '../../schemas/incident-words';
import { venueId } from './columns';

export const incidentKind = pgEnum('incident_kind', INCIDENT_KINDS);
export const incidentEventKind = pgEnum('incident_event_kind', INCIDENT_EVENT_KINDS);

/**
 * Something that happened to people on a night, as reported. Only what the report form asks is
 * kept: no guest names, addresses or medical detail beyond the first aid given. Never edited:
 * follow-up notes and the closing note are rows in incident_events, and a trigger refuses UPDATE
 * and DELETE (drizzle/0027_incidents_append_only.sql). A night with incidents is never removed.
 */
export const incidents = pgTable(
	'incidents',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: uuid('show_id')
			.notNull()
			.references(() => shows.id, { onDelete: 'cascade' }),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		kind: incidentKind('kind').notNull(),
		/** When it happened, as an instant (entered as the venue's wall-clock time). */
		happenedAt: timestamp('happened_at', { withTimezone: true }).notNull(),
		whatHappened: text('what_happened').notNull(),
		whatWasDone: text('what_was_done').notNull(),
		firstAid: boolean('first_aid').notNull(),
		/** What first aid was given, when it was; nothing more. */
		firstAidGiven: text('first_aid_given'),
		/** How long the show stopped, in whole minutes; 0 when it did not. */
		stoppedMinutes: integer('stopped_minutes').notNull().default(0),
		/** The venue member who sees to the follow-up, if someone does. */
		followUpBy: text('follow_up_by').references(() => users.id, { onDelete: 'set null' }),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		reportedAt: timestamp('reported_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('incidents_show').on(t.showId, t.happenedAt),
		index('incidents_venue').on(t.venueId),
		check('incidents_stopped_minutes', sql`${t.stoppedMinutes} >= 0`)
	]
);

/** Follow-up notes and the closing note of an incident, in order. Never edited. */
export const incidentEvents = pgTable(
	'incident_events',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		incidentId: uuid('incident_id')
			.notNull()
			.references(() => incidents.id, { onDelete: 'cascade' }),
		kind: incidentEventKind('kind').notNull(),
		note: text('note').notNull(),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('incident_events_incident').on(t.incidentId, t.at),
		// An incident is closed once.
		uniqueIndex('incident_events_one_close')
			.on(t.incidentId)
			.where(sql`${t.kind} = 'closed'`)
	]
);
