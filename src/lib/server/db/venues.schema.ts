import {
	bigint,
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
import { ROLES } from '../../roles';
import { CLOCKS } from '../../util/when';
import { users } from './auth.schema';

export const venueKind = pgEnum('venue_kind', ['haunt', 'trail', 'exhibit']);
export const roleEnum = pgEnum('role', ROLES);
export const clockEnum = pgEnum('clock', CLOCKS);

export const venues = pgTable('venues', {
	id: uuid('id').primaryKey().defaultRandom(),
	name: text('name').notNull(),
	slug: text('slug').notNull().unique(),
	kind: venueKind('kind').notNull(),
	timeZone: text('time_zone').notNull(),
	/** How times are written everywhere for this venue: '19:30' or '7:30 pm'. */
	clock: clockEnum('clock').notNull().default('24h'),
	address: text('address'),
	defaultGroupSize: integer('default_group_size').notNull().default(6),
	dispatchIntervalSeconds: integer('dispatch_interval_seconds').notNull().default(90),
	safetyContactName: text('safety_contact_name'),
	safetyContactPhone: text('safety_contact_phone'),
	/** Run sheets go out this many hours before crew call; 0 turns automatic sending off. */
	runSheetLeadHours: integer('run_sheet_lead_hours').notNull().default(24),
	/**
	 * Raised by triggers whenever something a checklist is generated from changes (scenes, cues,
	 * responses, props, sensors, outputs, rooms, safety items): a show whose checklist was made
	 * at an older number is regenerated once, by whoever needs it next.
	 */
	checklistInputsVersion: bigint('checklist_inputs_version', { mode: 'number' })
		.notNull()
		.default(0),
	createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
});

export const memberships = pgTable(
	'memberships',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		personId: text('person_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: roleEnum('role').notNull(),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		uniqueIndex('memberships_venue_person').on(t.venueId, t.personId),
		index('memberships_person').on(t.personId)
	]
);

export const invitations = pgTable(
	'invitations',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		email: text('email').notNull(),
		role: roleEnum('role').notNull(),
		/** SHA-256 of the token in the link; the token itself is only ever in the e-mail. */
		tokenHash: text('token_hash').notNull().unique(),
		invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
		expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
		acceptedAt: timestamp('accepted_at', { withTimezone: true }),
		acceptedBy: text('accepted_by').references(() => users.id, { onDelete: 'set null' }),
		revokedAt: timestamp('revoked_at', { withTimezone: true })
	},
	(t) => [index('invitations_venue').on(t.venueId)]
);

export const rooms = pgTable(
	'rooms',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		notes: text('notes'),
		position: integer('position').notNull().default(0),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('rooms_venue_name').on(t.venueId, t.name)]
);

export const auditLog = pgTable(
	'audit_log',
	{
		id: bigint('id', { mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
		venueId: uuid('venue_id').references(() => venues.id, { onDelete: 'cascade' }),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		action: text('action').notNull(),
		detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({}),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('audit_log_venue_at').on(t.venueId, t.at)]
);
