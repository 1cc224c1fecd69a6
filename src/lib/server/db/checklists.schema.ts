import {
	boolean,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { rooms } from './venues.schema';
import { outputs, props, sensors } from './props.schema';
import { shows } from './schedule.schema';
import { CHECK_KINDS, type CheckExpected } from '../../checklists/generate';
import { venueId } from './columns';

export const checkKind = pgEnum('check_kind', CHECK_KINDS);
export const checkOutcome = pgEnum('check_outcome', ['pass', 'fail']);

const showId = () =>
	uuid('show_id')
		.notNull()
		.references(() => shows.id, { onDelete: 'cascade' });

/** The venue's own safety walk (exits, extinguishers…), edited by show managers. */
export const venueSafetyItems = pgTable(
	'venue_safety_items',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		label: text('label').notNull(),
		position: integer('position').notNull().default(0),
		/** Retired items stay for the checklists that used them. */
		active: boolean('active').notNull().default(true),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('venue_safety_items_venue').on(t.venueId, t.position)]
);

/** One line of a show's generated checklist. Never deleted: a line no longer generated gets removedAt. */
export const checks = pgTable(
	'checks',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showId(),
		/** Stable key from the generator (sensor:<id>, output:<id>, safety:…, venue:<id>). */
		key: text('key').notNull(),
		kind: checkKind('kind').notNull(),
		propId: uuid('prop_id').references(() => props.id, { onDelete: 'set null' }),
		sensorId: uuid('sensor_id').references(() => sensors.id, { onDelete: 'set null' }),
		outputId: uuid('output_id').references(() => outputs.id, { onDelete: 'set null' }),
		safetyItemId: uuid('safety_item_id').references(() => venueSafetyItems.id, {
			onDelete: 'set null'
		}),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		label: text('label').notNull(),
		detail: text('detail').notNull().default(''),
		required: boolean('required').notNull().default(true),
		expected: jsonb('expected').$type<CheckExpected>().notNull(),
		sortKey: text('sort_key').notNull(),
		removedAt: timestamp('removed_at', { withTimezone: true }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('checks_show_key').on(t.showId, t.key), index('checks_venue').on(t.venueId)]
);

/**
 * Append-only history of results: a correction is a new row. The latest row per check is its state.
 * A database trigger refuses UPDATE and DELETE (see drizzle/0006_check_history_append_only.sql).
 */
export const checkResults = pgTable(
	'check_results',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showId(),
		checkId: uuid('check_id')
			.notNull()
			.references(() => checks.id, { onDelete: 'cascade' }),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		outcome: checkOutcome('outcome').notNull(),
		idleReading: doublePrecision('idle_reading'),
		presentReading: doublePrecision('present_reading'),
		note: text('note'),
		photoKey: text('photo_key'),
		/** Made by the phone before sending, so a result replayed after a dropped connection is stored once. */
		clientId: uuid('client_id').notNull().unique(),
		/** When the phone says it was recorded (its own clock); the server's time when it sent none. */
		recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
		/** When the server stored it. */
		receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
		/**
		 * The phone's time was in the future or more than a day before receipt: not used for ordering
		 * (the received time is), and shown as "phone clock looked wrong".
		 */
		clockSuspect: boolean('clock_suspect').notNull().default(false),
		/** Arrived after the night was signed off: kept as a late correction, the sign-off stands. */
		afterSignOff: boolean('after_sign_off').notNull().default(false),
		/**
		 * Both readings came from the sensor's board, as taken (not typed), and the server found the
		 * present reading among the readings the board sent.
		 */
		fromBoard: boolean('from_board').notNull().default(false),
		/** When the board sent the present reading (the server's time), for a result from the board. */
		boardReadAt: timestamp('board_read_at', { withTimezone: true })
	},
	(t) => [
		index('check_results_check').on(t.checkId, t.recordedAt),
		index('check_results_show').on(t.showId, t.recordedAt)
	]
);

/** A photo uploaded for a check; the server made its key, results refer to it by id. */
export const checkPhotos = pgTable(
	'check_photos',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: showId(),
		key: text('key').notNull().unique(),
		contentType: text('content_type').notNull(),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		/** Made by the phone before uploading, so a photo sent again after a dropped connection is stored once. */
		clientId: uuid('client_id').unique(),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('check_photos_show').on(t.showId)]
);

export interface CrewProblemAck {
	/** Stable key of the problem (kind and the person or position it is about). */
	key: string;
	kind: 'double_booked' | 'unfilled' | 'unavailable';
	message: string;
}

/** The show manager's permanent record that the night is ready. */
export const signOffs = pgTable('sign_offs', {
	id: uuid('id').primaryKey().defaultRandom(),
	venueId: venueId(),
	showId: showId().unique(),
	personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
	note: text('note'),
	/** The night's crew problems the show manager acknowledged when signing. */
	acknowledged: jsonb('acknowledged').$type<CrewProblemAck[]>().notNull().default([]),
	at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
});
