import PgBoss from 'pg-boss';
import { eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { mailMessages } from '../db/schema';
import {
	deliverMail,
	resendKeyFor,
	staleQueued,
	storeMail,
	type MailMessage,
	type OutgoingMail,
	type SendFn
} from './outbox';

export const MAIL_QUEUE = 'mail-send';

export interface MailQueueOptions {
	connectionString: string;
	db: Db;
	send: SendFn;
	/** Domain for Message-IDs. */
	domain?: string;
	/** Retries after the first try; with backoff, 10 tries from 30 s span several hours. */
	retryLimit?: number;
	retryDelaySeconds?: number;
	pollingIntervalSeconds?: number;
}

interface Running {
	boss: PgBoss;
	db: Db;
	retry: { retryLimit: number; retryDelay: number; retryBackoff: true };
}

let running: Running | null = null;

/**
 * Start pg-boss on the app's database and a worker for outgoing mail. Every app server runs one;
 * they share the queue, and the row lock in deliverMail keeps sends single.
 */
export async function startMailQueue(o: MailQueueOptions) {
	if (running) return running.boss;
	const boss = new PgBoss({ connectionString: o.connectionString, max: 4 });
	boss.on('error', (e) => console.error('[mail queue]', e.message));
	await boss.start();
	const retry = {
		retryLimit: o.retryLimit ?? 10,
		retryDelay: o.retryDelaySeconds ?? 30,
		retryBackoff: true as const
	};
	await boss.createQueue(MAIL_QUEUE, { name: MAIL_QUEUE, ...retry });
	await boss.work<{ messageId: string }>(
		MAIL_QUEUE,
		{ includeMetadata: true, batchSize: 5, pollingIntervalSeconds: o.pollingIntervalSeconds ?? 2 },
		async (jobs) => {
			// A failed send fails only its own job (pg-boss retries it later with backoff);
			// the rest of the batch completes when this handler returns.
			for (const job of jobs) {
				const result = await deliverMail(o.db, job.data.messageId, o.send, {
					lastTry: job.retryCount >= job.retryLimit,
					domain: o.domain
				}).catch((e: unknown) => ({
					outcome: 'error' as const,
					reason: e instanceof Error ? e.message : String(e)
				}));
				if (result.outcome === 'error')
					await boss.fail(MAIL_QUEUE, job.id, { reason: result.reason }).catch(() => {});
			}
		}
	);
	running = { boss, db: o.db, retry };
	// Rows stored while no job could be created (a crash between the two writes) get one now.
	const stale = await staleQueued(o.db, new Date(Date.now() - 60_000));
	for (const m of stale) await sendJob(m.id);
	return boss;
}

export async function stopMailQueue() {
	const r = running;
	running = null;
	if (r) await r.boss.stop({ graceful: true, wait: true, timeout: 5000 }).catch(() => {});
}

async function sendJob(messageId: string) {
	if (!running) throw new Error('The mail queue is not running.');
	await running.boss.send(MAIL_QUEUE, { messageId }, running.retry);
}

/** Store a message and queue its delivery. Queuing the same version to the same person again is a no-op. */
export async function queueMail(db: Db, mail: OutgoingMail) {
	const { message, needsJob } = await storeMail(db, mail);
	if (needsJob) await sendJob(message.id);
	return message;
}

/**
 * Send a stored message again as a new message of its own (so the log keeps both), with content
 * from `render` when the old body cannot be reused.
 */
export async function resendMail(
	db: Db,
	original: MailMessage,
	actorId: string,
	render?: () => Promise<Pick<OutgoingMail, 'subject' | 'html' | 'text'>>
) {
	const fresh = render ? await render() : null;
	if (!fresh && (original.html === null || original.text === null))
		throw new Error('This message can no longer be re-sent.');
	const { rootId, key } = await resendKeyFor(db, original);
	const { message, needsJob } = await storeMail(
		db,
		{
			venueId: original.venueId,
			kind: original.kind,
			subjectId: original.subjectId,
			recipient: original.recipient,
			subject: fresh?.subject ?? original.subject,
			html: fresh?.html ?? original.html!,
			text: fresh?.text ?? original.text!,
			queuedBy: actorId
		},
		key
	);
	await db
		.update(mailMessages)
		.set({ resendOf: rootId, attachments: original.attachments })
		.where(eq(mailMessages.id, message.id));
	if (needsJob) await sendJob(message.id);
	return message;
}
