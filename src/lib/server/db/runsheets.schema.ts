import {
	index,
	integer,
	jsonb,
	pgTable,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { mailMessages } from './mail.schema';
import { shows } from './schedule.schema';
import { venues } from './venues.schema';

import type { SheetSummary } from '../../runsheets/changes';

/** What one person's run sheet said, kept to tell what changed when it is sent again. */
export type RunSheetSnapshot = SheetSummary;

/**
 * One revision of one person's run sheet for one show, queued for sending. The content hash tells
 * whether anything changed since the last revision: the same content never goes out twice, and a
 * change makes the next revision (sent as a change notice). Revision and hash together are the
 * version in the e-mail's dedupe key.
 */
export const runSheetSends = pgTable(
	'run_sheet_sends',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id')
			.notNull()
			.references(() => venues.id, { onDelete: 'cascade' }),
		showId: uuid('show_id')
			.notNull()
			.references(() => shows.id, { onDelete: 'cascade' }),
		personId: text('person_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		contentHash: text('content_hash').notNull(),
		/** 1 for the first run sheet this person got for this show, then 2, 3… */
		revision: integer('revision').notNull(),
		/** The ICS SEQUENCE sent with this version. */
		sequence: integer('sequence').notNull(),
		snapshot: jsonb('snapshot').$type<RunSheetSnapshot>().notNull(),
		/** Why it went: sent by hand, automatically before crew call, or as a change notice. */
		reason: text('reason').$type<'send' | 'auto' | 'change'>().notNull(),
		mailMessageId: uuid('mail_message_id').references(() => mailMessages.id, {
			onDelete: 'set null'
		}),
		queuedBy: text('queued_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		uniqueIndex('run_sheet_sends_revision').on(t.showId, t.personId, t.revision),
		index('run_sheet_sends_venue_show').on(t.venueId, t.showId)
	]
);
