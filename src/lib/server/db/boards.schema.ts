import {
	bigint,
	doublePrecision,
	index,
	integer,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { controllers, sensors } from './props.schema';
import { createdAt, venueId } from './columns';

// Boards (controllers) sending readings. The readings themselves live in `readings`, a table
// partitioned by day that drizzle does not describe: it is made in a hand-written migration and
// queried with SQL in src/lib/server/boards/.

/** A controller's key: only the SHA-256 of the token is kept; the token is shown once. */
export const boardKeys = pgTable(
	'board_keys',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		controllerId: uuid('controller_id')
			.notNull()
			.references(() => controllers.id, { onDelete: 'cascade' }),
		tokenHash: text('token_hash').notNull().unique(),
		/** The token's first characters, so people can tell keys apart. */
		hint: text('hint').notNull(),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
		revokedAt: timestamp('revoked_at', { withTimezone: true })
	},
	(t) => [index('board_keys_controller').on(t.venueId, t.controllerId)]
);

/** Per-minute figures of one sensor's readings, kept after the raw readings are dropped. */
export const readingMinutes = pgTable(
	'reading_minutes',
	{
		venueId: venueId(),
		sensorId: uuid('sensor_id')
			.notNull()
			.references(() => sensors.id, { onDelete: 'cascade' }),
		minute: timestamp('minute', { withTimezone: true }).notNull(),
		count: integer('count').notNull(),
		mean: doublePrecision('mean').notNull(),
		/** Sample standard deviation (n − 1); 0 for a single reading. */
		sigma: doublePrecision('sigma').notNull(),
		min: doublePrecision('min').notNull(),
		max: doublePrecision('max').notNull(),
		/** The highest board sequence number in the minute. */
		lastSeq: bigint('last_seq', { mode: 'number' }).notNull()
	},
	(t) => [
		primaryKey({ columns: [t.sensorId, t.minute] }),
		index('reading_minutes_venue').on(t.venueId, t.minute)
	]
);

/** How far the rollup has got: one row. */
export const readingRollupState = pgTable('reading_rollup_state', {
	id: integer('id').primaryKey(),
	through: timestamp('through', { withTimezone: true }).notNull()
});
