import { createHash } from 'node:crypto';
import { and, count, eq, lt, or } from 'drizzle-orm';
import type { Db } from '../db/client';
import { mailMessages, type MailAttachment, type MailKind } from '../db/schema';

export type MailMessage = typeof mailMessages.$inferSelect;

/** Kinds whose body carries a one-time link: the body is dropped once the message is settled. */
const SECRET_KINDS: MailKind[] = ['sign_in_link', 'invitation'];

export interface OutgoingMail {
	venueId: string | null;
	kind: MailKind;
	subjectId?: string | null;
	/** Bumped whenever the content changes enough to be worth sending again (a new run-sheet version). */
	version?: number | string;
	recipient: string;
	subject: string;
	html: string;
	text: string;
	attachments?: { filename: string; contentType: string; content: string | Buffer }[];
	queuedBy?: string | null;
}

/** What the SMTP side needs; the transport turns it into one message. */
export interface Envelope {
	to: string;
	subject: string;
	html: string;
	text: string;
	messageId: string;
	attachments: MailAttachment[];
}
export type SendFn = (mail: Envelope) => Promise<void>;

export function dedupeKeyFor(
	m: Pick<OutgoingMail, 'kind' | 'subjectId' | 'version' | 'recipient'>
) {
	return [m.kind, m.subjectId ?? '-', `v${m.version ?? 1}`, m.recipient.trim().toLowerCase()].join(
		':'
	);
}

/** A stable Message-ID per dedupe key: if a message ever does go out twice, mail clients show it once. */
export function messageIdFor(dedupeKey: string, domain = 'gloaming.mail') {
	const h = createHash('sha256').update(dedupeKey).digest('hex').slice(0, 40);
	return `<${h}@${domain}>`;
}

function toAttachments(list: OutgoingMail['attachments'] = []): MailAttachment[] {
	return list.map((a) => ({
		filename: a.filename,
		contentType: a.contentType,
		content: (typeof a.content === 'string' ? Buffer.from(a.content, 'utf8') : a.content).toString(
			'base64'
		)
	}));
}

/**
 * Store a message to be sent, once per dedupe key. Returns the stored row and whether it still
 * needs a delivery job (false when that version already went to that person).
 */
export async function storeMail(db: Db, mail: OutgoingMail, dedupeKey = dedupeKeyFor(mail)) {
	const [inserted] = await db
		.insert(mailMessages)
		.values({
			venueId: mail.venueId,
			kind: mail.kind,
			subjectId: mail.subjectId ?? null,
			recipient: mail.recipient.trim(),
			subject: mail.subject,
			dedupeKey,
			html: mail.html,
			text: mail.text,
			attachments: toAttachments(mail.attachments),
			queuedBy: mail.queuedBy ?? null
		})
		.onConflictDoNothing({ target: mailMessages.dedupeKey })
		.returning();
	if (inserted) return { message: inserted, needsJob: true };
	const [existing] = await db
		.select()
		.from(mailMessages)
		.where(eq(mailMessages.dedupeKey, dedupeKey));
	return { message: existing, needsJob: existing.status === 'queued' };
}

export type DeliveryResult =
	{ outcome: 'sent' | 'skipped' } | { outcome: 'error'; reason: string; final: boolean };

function reasonOf(e: unknown) {
	const raw = e instanceof Error ? e.message : String(e);
	return raw.replace(/\s+/g, ' ').slice(0, 500) || 'The mail server refused the message.';
}

/**
 * Send one stored message if it is still queued. The row stays locked while the SMTP server
 * takes the message, so two workers (or a retried job) never send the same row twice.
 */
export async function deliverMail(
	db: Db,
	messageId: string,
	send: SendFn,
	opts: { lastTry: boolean; domain?: string }
): Promise<DeliveryResult> {
	return db.transaction(async (tx) => {
		const [m] = await tx
			.select()
			.from(mailMessages)
			.where(eq(mailMessages.id, messageId))
			.for('update');
		if (!m || m.status !== 'queued') return { outcome: 'skipped' as const };
		const clear = SECRET_KINDS.includes(m.kind);
		try {
			await send({
				to: m.recipient,
				subject: m.subject,
				html: m.html ?? '',
				text: m.text ?? '',
				messageId: messageIdFor(m.dedupeKey, opts.domain),
				attachments: m.attachments
			});
		} catch (e) {
			const reason = reasonOf(e);
			await tx
				.update(mailMessages)
				.set({
					attempts: m.attempts + 1,
					lastError: reason,
					...(opts.lastTry ? { status: 'failed' as const } : {}),
					...(opts.lastTry && clear ? { html: null, text: null } : {})
				})
				.where(eq(mailMessages.id, m.id));
			return { outcome: 'error' as const, reason, final: opts.lastTry };
		}
		await tx
			.update(mailMessages)
			.set({
				status: 'sent',
				attempts: m.attempts + 1,
				sentAt: new Date(),
				lastError: null,
				...(clear ? { html: null, text: null } : {})
			})
			.where(eq(mailMessages.id, m.id));
		return { outcome: 'sent' as const };
	});
}

/** The dedupe key of the next re-send of a message: the first message's key plus a counter. */
export async function resendKeyFor(db: Db, original: MailMessage) {
	const rootId = original.resendOf ?? original.id;
	const [root] = await db.select().from(mailMessages).where(eq(mailMessages.id, rootId));
	const [{ n }] = await db
		.select({ n: count() })
		.from(mailMessages)
		.where(eq(mailMessages.resendOf, rootId));
	return { rootId, key: `${(root ?? original).dedupeKey}#resend${n + 1}` };
}

export async function findMail(db: Db, venueId: string, id: string) {
	const [m] = await db
		.select()
		.from(mailMessages)
		.where(and(eq(mailMessages.id, id), eq(mailMessages.venueId, venueId)));
	return m ?? null;
}

/** Messages still queued but older than the cut-off: their job may have been lost. */
export function staleQueued(db: Db, olderThan: Date) {
	return db
		.select({ id: mailMessages.id })
		.from(mailMessages)
		.where(and(eq(mailMessages.status, 'queued'), or(lt(mailMessages.queuedAt, olderThan))));
}
