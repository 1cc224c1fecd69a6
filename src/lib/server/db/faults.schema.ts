import {
	boolean,
	index,
	integer,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { rooms } from './venues.schema';
import { props } from './props.schema';
import { shows } from './schedule.schema';
import { checkResults, checks } from './checklists.schema';
import { FAULT_EVENT_KINDS, FAULT_SEVERITIES } from '../../faults/downtime';
import { venueId } from './columns';

export const faultSeverity = pgEnum('fault_severity', FAULT_SEVERITIES);
export const faultEventKind = pgEnum('fault_event_kind', FAULT_EVENT_KINDS);

/**
 * A fault reported on a prop: what was seen, how bad, where. Never edited: what happens to it
 * afterwards is a row in fault_events (reported, repaired, re-tested, closed), and its state is
 * read from those. A trigger refuses UPDATE and DELETE (drizzle/0021_faults_append_only.sql).
 */
export const faults = pgTable(
	'faults',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		/** The night and the failed check it was reported from, when it was. */
		showId: uuid('show_id').references(() => shows.id, { onDelete: 'set null' }),
		checkId: uuid('check_id').references(() => checks.id, { onDelete: 'set null' }),
		severity: faultSeverity('severity').notNull(),
		seen: text('seen').notNull(),
		photoKey: text('photo_key'),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		reportedAt: timestamp('reported_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('faults_prop').on(t.propId, t.reportedAt), index('faults_venue').on(t.venueId)]
);

/** What happened to a fault, in order. Never edited; a correction is a new row. */
export const faultEvents = pgTable(
	'fault_events',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		faultId: uuid('fault_id')
			.notNull()
			.references(() => faults.id, { onDelete: 'cascade' }),
		kind: faultEventKind('kind').notNull(),
		/** Repaired: what was done, the parts used, minutes spent. */
		action: text('action'),
		parts: text('parts'),
		minutes: integer('minutes'),
		/** Re-tested: pass or fail, and the check result it stands on when it was linked. */
		passed: boolean('passed'),
		checkResultId: uuid('check_result_id').references(() => checkResults.id, {
			onDelete: 'set null'
		}),
		note: text('note'),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('fault_events_fault').on(t.faultId, t.at)]
);
