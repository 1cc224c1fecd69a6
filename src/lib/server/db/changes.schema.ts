import { index, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { outputs, props, sensors } from './props.schema';
import { CHANGE_PARTS } from '../../schemas/change-words';
import { venueId } from './columns';

export const changePart = pgEnum('change_part', CHANGE_PARTS);

/**
 * A change to a prop made after it had been on a signed-off night: what changed (old and new
 * values, and a line for people), who, when and why. Never edited or removed while the prop exists
 * (drizzle/0027_change_records_append_only.sql). Until a later night with the prop is signed off, the
 * prop's checklist carries a re-test line for it.
 */
export const changeRecords = pgTable(
	'change_records',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		sensorId: uuid('sensor_id').references(() => sensors.id, { onDelete: 'set null' }),
		outputId: uuid('output_id').references(() => outputs.id, { onDelete: 'set null' }),
		part: changePart('part').notNull(),
		/** The sensor's or output's name when the change was made. */
		partName: text('part_name').notNull(),
		/** What changed, in people's words: "Gap to the hand 20 mm → 12 mm". */
		summary: text('summary').notNull(),
		oldValue: jsonb('old_value').$type<Record<string, unknown>>().notNull(),
		newValue: jsonb('new_value').$type<Record<string, unknown>>().notNull(),
		reason: text('reason').notNull(),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('change_records_prop').on(t.propId, t.at),
		index('change_records_venue').on(t.venueId, t.at)
	]
);
