import { index, integer, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { MAIL_KINDS, MAIL_STATUSES, type MailKind, type MailStatus } from '../../mail-words';
import { users } from './auth.schema';
import { venues } from './venues.schema';

export { MAIL_KINDS, MAIL_STATUSES, type MailKind, type MailStatus };

export const mailKind = pgEnum('mail_kind', MAIL_KINDS);
export const mailStatus = pgEnum('mail_status', MAIL_STATUSES);

/** A small attachment kept with the message (an ICS file for a crew call), content in base64. */
export interface MailAttachment {
	filename: string;
	contentType: string;
	content: string;
}

/**
 * One e-mail to one recipient. The dedupe key names what the message is about and which version
 * (kind + subject entity + version + recipient), so a retried or re-queued job never sends the
 * same version to the same person twice.
 */
export const mailMessages = pgTable(
	'mail_messages',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: uuid('venue_id').references(() => venues.id, { onDelete: 'cascade' }),
		kind: mailKind('kind').notNull(),
		/** The thing the message is about (an invitation id, later a show id). */
		subjectId: text('subject_id'),
		recipient: text('recipient').notNull(),
		subject: text('subject').notNull(),
		dedupeKey: text('dedupe_key').notNull().unique(),
		status: mailStatus('status').notNull().default('queued'),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		/** Rendered bodies; cleared after delivery for kinds whose body carries a secret link. */
		html: text('html'),
		text: text('text'),
		attachments: jsonb('attachments').$type<MailAttachment[]>().notNull().default([]),
		/** Set on a re-send: the message this one repeats. */
		resendOf: uuid('resend_of'),
		queuedBy: text('queued_by').references(() => users.id, { onDelete: 'set null' }),
		queuedAt: timestamp('queued_at', { withTimezone: true }).notNull().defaultNow(),
		sentAt: timestamp('sent_at', { withTimezone: true })
	},
	(t) => [index('mail_messages_venue_queued').on(t.venueId, t.queuedAt)]
);
