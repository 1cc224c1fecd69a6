import {
	boolean,
	doublePrecision,
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
import { outputs, props } from './props.schema';
import { shows } from './schedule.schema';
import { WEAR_KINDS } from '../../wear/counters';
import { CLOSE_KINDS } from '../../checklists/close';
import { venueId } from './columns';

// Guest counts, wear settings, maintenance records and the close-of-night checklist. Every table
// but close_checks is history: a trigger refuses UPDATE and DELETE
// (drizzle/0030_wear_append_only.sql); a correction is a new row and the latest row counts.

export const wearKind = pgEnum('wear_kind', WEAR_KINDS);
export const closeKind = pgEnum('close_kind', CLOSE_KINDS);

const showRef = () =>
	uuid('show_id')
		.notNull()
		.references(() => shows.id, { onDelete: 'cascade' });
const person = () => text('person_id').references(() => users.id, { onDelete: 'set null' });
const at = () => timestamp('at', { withTimezone: true }).notNull().defaultNow();

/** Guests through on a night, entered at close; the latest row per show counts. */
export const guestCounts = pgTable(
	'guest_counts',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showRef(),
		guests: integer('guests').notNull(),
		/** Guests per group, when the groups were given that way. */
		groupSize: integer('group_size'),
		/** Number of groups, when it was counted directly. */
		groups: integer('groups'),
		personId: person(),
		at: at()
	},
	(t) => [index('guest_counts_show').on(t.venueId, t.showId, t.at)]
);

/** An output's rated life and maintenance interval set by its designer; the latest row counts. */
export const wearSettings = pgTable(
	'wear_settings',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		outputId: uuid('output_id')
			.notNull()
			.references(() => outputs.id, { onDelete: 'cascade' }),
		kind: wearKind('kind').notNull(),
		ratedLife: doublePrecision('rated_life').notNull(),
		interval: doublePrecision('interval').notNull(),
		personId: person(),
		at: at()
	},
	(t) => [index('wear_settings_output').on(t.venueId, t.outputId, t.at)]
);

/** Maintenance done on an output; the newest starts its counter again. */
export const maintenanceRecords = pgTable(
	'maintenance_records',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		outputId: uuid('output_id')
			.notNull()
			.references(() => outputs.id, { onDelete: 'cascade' }),
		note: text('note').notNull(),
		personId: person(),
		at: at()
	},
	(t) => [index('maintenance_records_output').on(t.venueId, t.outputId, t.at)]
);

/** One line of a show's close-of-night checklist; a line no longer generated gets removedAt. */
export const closeChecks = pgTable(
	'close_checks',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showRef(),
		key: text('key').notNull(),
		kind: closeKind('kind').notNull(),
		propId: uuid('prop_id').references(() => props.id, { onDelete: 'set null' }),
		outputId: uuid('output_id').references(() => outputs.id, { onDelete: 'set null' }),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		label: text('label').notNull(),
		detail: text('detail').notNull().default(''),
		required: boolean('required').notNull().default(true),
		sortKey: text('sort_key').notNull(),
		removedAt: timestamp('removed_at', { withTimezone: true }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('close_checks_show_key').on(t.showId, t.key)]
);

/** Ticks of close-of-night lines: the latest per line is its state. */
export const closeResults = pgTable(
	'close_results',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showRef(),
		closeCheckId: uuid('close_check_id')
			.notNull()
			.references(() => closeChecks.id, { onDelete: 'cascade' }),
		passed: boolean('passed').notNull(),
		note: text('note'),
		personId: person(),
		at: at()
	},
	(t) => [index('close_results_show').on(t.showId, t.at)]
);

/** The show manager's record that the night is closed; one per show. */
export const closeSignOffs = pgTable('close_sign_offs', {
	id: uuid('id').primaryKey().defaultRandom(),
	venueId: venueId(),
	showId: showRef().unique(),
	personId: person(),
	note: text('note'),
	at: at()
});
