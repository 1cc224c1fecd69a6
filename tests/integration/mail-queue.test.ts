import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import nodemailer from 'nodemailer';
import { eq, inArray } from 'drizzle-orm';
import ICAL from 'ical.js';
import type { ChildProcess } from 'node:child_process';
import { mailMessages } from '../../src/lib/server/db/schema';
import {
	deliverMail,
	messageIdFor,
	storeMail,
	type Envelope,
	type SendFn
} from '../../src/lib/server/mail/outbox';
import { envelopeSender } from '../../src/lib/server/mail/envelope';
import {
	queueMail,
	resendMail,
	startMailQueue,
	stopMailQueue
} from '../../src/lib/server/mail/queue';
import { caught, caughtOne, catcherSmtpPort, startCatcher, stopCatcher } from './catcher';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();
const smtp = envelopeSender(
	nodemailer.createTransport({ host: '127.0.0.1', port: catcherSmtpPort, secure: false }),
	'Gloaming <no-reply@gloaming.test>'
);
// The queue in this process sends through whatever the current test plugs in here.
let send: SendFn = smtp;

beforeAll(async () => {
	await startMailQueue({
		connectionString: inject('databaseUrl'),
		db,
		send: (m) => send(m),
		retryLimit: 5,
		retryDelaySeconds: 1,
		pollingIntervalSeconds: 0.5
	});
});
afterAll(() => stopMailQueue());

function mail(recipient: string, over: Partial<Parameters<typeof queueMail>[1]> = {}) {
	return {
		venueId: null,
		kind: 'schedule_change' as const,
		subjectId: randomUUID(),
		recipient,
		subject: 'Crew call moved',
		html: '<p>Crew call is now 17:30.</p>',
		text: 'Crew call is now 17:30.',
		...over
	};
}

async function settled(ids: string[], timeoutMs = 45_000) {
	const until = Date.now() + timeoutMs;
	for (;;) {
		const rows = await db.select().from(mailMessages).where(inArray(mailMessages.id, ids));
		if (rows.every((r) => r.status !== 'queued') || Date.now() > until) return rows;
		await new Promise((r) => setTimeout(r, 200));
	}
}

describe('outgoing mail, without SMTP', () => {
	it('stores one message per dedupe key and delivers it once, even when asked twice at once', async () => {
		const sent: Envelope[] = [];
		const slowSend: SendFn = async (m) => {
			await new Promise((r) => setTimeout(r, 100));
			sent.push(m);
		};
		const m = mail(`${randomUUID()}@gloaming.test`);
		const first = await storeMail(db, m);
		const again = await storeMail(db, m);
		expect(first.needsJob).toBe(true);
		expect(again.message.id).toBe(first.message.id);
		const results = await Promise.all([
			deliverMail(db, first.message.id, slowSend, { lastTry: false }),
			deliverMail(db, first.message.id, slowSend, { lastTry: false })
		]);
		expect(results.map((r) => r.outcome).sort()).toEqual(['sent', 'skipped']);
		expect(sent).toHaveLength(1);
		expect(sent[0].messageId).toBe(messageIdFor(first.message.dedupeKey));
		const after = await storeMail(db, m);
		expect(after.needsJob).toBe(false);
	});

	it('records each failed try with its reason, and fails the message on the last try', async () => {
		const refuse: SendFn = async () => {
			throw new Error('550 mailbox unavailable');
		};
		const { message } = await storeMail(db, mail(`${randomUUID()}@gloaming.test`));
		const a = await deliverMail(db, message.id, refuse, { lastTry: false });
		expect(a).toMatchObject({ outcome: 'error', final: false });
		let [row] = await db.select().from(mailMessages).where(eq(mailMessages.id, message.id));
		expect(row).toMatchObject({
			status: 'queued',
			attempts: 1,
			lastError: '550 mailbox unavailable'
		});
		await deliverMail(db, message.id, refuse, { lastTry: true });
		[row] = await db.select().from(mailMessages).where(eq(mailMessages.id, message.id));
		expect(row).toMatchObject({ status: 'failed', attempts: 2 });
	});

	it('drops the body of an invitation once sent, since it holds a one-time link', async () => {
		const { message } = await storeMail(
			db,
			mail(`${randomUUID()}@gloaming.test`, { kind: 'invitation', text: 'https://x/invitations/t' })
		);
		await deliverMail(db, message.id, async () => {}, { lastTry: false });
		const [row] = await db.select().from(mailMessages).where(eq(mailMessages.id, message.id));
		expect(row).toMatchObject({ status: 'sent', text: null, html: null });
	});
});

describe('outgoing mail through the queue and the local mail catcher', () => {
	let catcher: ChildProcess | null = null;
	afterAll(async () => {
		if (catcher) await stopCatcher(catcher);
	});

	// Generous time limits: the catcher starts through tsx, and retries back off (1 s, 2 s, 4 s…).
	it(
		'keeps messages while the mail server is down and delivers each exactly once when it is back',
		{
			timeout: 90_000
		},
		async () => {
			send = smtp;
			catcher = await startCatcher();
			await stopCatcher(catcher);
			const people = [1, 2, 3].map((i) => `down-${i}-${randomUUID()}@gloaming.test`);
			const queued = [];
			for (const p of people) queued.push(await queueMail(db, mail(p)));
			// Queuing the same versions again must not send anything twice.
			for (const p of people)
				await queueMail(db, { ...mail(p), subjectId: queued[people.indexOf(p)].subjectId });

			const until = Date.now() + 20_000;
			let tried: (typeof mailMessages.$inferSelect)[] = [];
			while (Date.now() < until) {
				tried = await db
					.select()
					.from(mailMessages)
					.where(
						inArray(
							mailMessages.id,
							queued.map((q) => q.id)
						)
					);
				if (tried.every((r) => r.attempts >= 1)) break;
				await new Promise((r) => setTimeout(r, 200));
			}
			expect(tried.every((r) => r.status === 'queued' && r.attempts >= 1 && r.lastError)).toBe(
				true
			);

			catcher = await startCatcher();
			const rows = await settled(queued.map((q) => q.id));
			expect(rows.map((r) => r.status)).toEqual(['sent', 'sent', 'sent']);
			await new Promise((r) => setTimeout(r, 1500));
			for (const p of people) expect(await caught(p)).toHaveLength(1);
		}
	);

	it(
		'sends an ICS attachment that reads back through the catcher, and re-sends as a new message',
		{
			timeout: 90_000
		},
		async () => {
			send = smtp;
			if (!catcher || catcher.exitCode !== null) catcher = await startCatcher();
			const owner = await makePerson(db);
			const { venue } = await makeVenue(db, [[owner.id, 'owner']]);
			const to = `ics-${randomUUID()}@gloaming.test`;
			const ics = [
				'BEGIN:VCALENDAR',
				'VERSION:2.0',
				'PRODID:-//Gloaming//Run sheet//EN',
				'BEGIN:VEVENT',
				'UID:crew-call-test@gloaming.test',
				'DTSTAMP:20261002T120000Z',
				'DTSTART:20261031T163000Z',
				'DTEND:20261031T230000Z',
				'SUMMARY:Crew call',
				'END:VEVENT',
				'END:VCALENDAR',
				''
			].join('\r\n');
			const m = await queueMail(db, {
				...mail(to),
				venueId: venue.id,
				kind: 'run_sheet',
				subject: 'Run sheet for Saturday 31 October',
				attachments: [{ filename: 'crew-call.ics', contentType: 'text/calendar', content: ics }]
			});
			await settled([m.id]);
			const [summary] = await caught(to);
			const got = await caughtOne(summary.id);
			expect(got.subject).toBe('Run sheet for Saturday 31 October');
			expect(got.envelopeTo).toEqual([to]);
			expect(got.text).toContain('Crew call is now 17:30.');
			expect(got.html).toContain('<p>Crew call is now 17:30.</p>');
			expect(got.attachments).toHaveLength(1);
			expect(got.attachments[0]).toMatchObject({ filename: 'crew-call.ics' });
			expect(got.attachments[0].contentType).toMatch(/^text\/calendar/);
			const parsed = new ICAL.Component(
				ICAL.parse(Buffer.from(got.attachments[0].content!, 'base64').toString('utf8'))
			);
			expect(parsed.getFirstSubcomponent('vevent')?.getFirstPropertyValue('summary')).toBe(
				'Crew call'
			);

			const [stored] = await db.select().from(mailMessages).where(eq(mailMessages.id, m.id));
			const again = await resendMail(db, stored, owner.id);
			expect(again.id).not.toBe(m.id);
			await settled([again.id]);
			const [row] = await db.select().from(mailMessages).where(eq(mailMessages.id, again.id));
			expect(row).toMatchObject({ status: 'sent', resendOf: m.id });
			expect(row.attachments).toHaveLength(1);
			expect(await caught(to)).toHaveLength(2);
		}
	);
});
