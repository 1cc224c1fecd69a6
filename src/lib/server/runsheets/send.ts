import { and, desc, eq, gt, inArray, lte, sql } from 'drizzle-orm';
import { renderRunSheet } from '$emails/run-sheet';
import { renderScheduleChange } from '$emails/schedule-change';
import { sheetChanges, type SheetChange, type SheetSummary } from '$lib/runsheets/changes';
import { zonedEventCalendar } from '$lib/runsheets/ics';
import { showTimesText } from '$lib/schedule/ics';
import type { Db } from '$lib/server/db/client';
import type { MailStatus } from '$lib/mail-words';
import {
	mailMessages,
	memberships,
	runSheetSends,
	shows,
	users,
	venues
} from '$lib/server/db/schema';
import { queueMail } from '$lib/server/mail/queue';
import { localDay } from '$lib/util/when';
import { buildShowRunSheets, runSheetUrl, type Show, type Venue } from './build';
import { config } from '$lib/server/config';

export type SendReason = 'send' | 'auto' | 'change';
type SendRow = typeof runSheetSends.$inferSelect;

/** UID of a person's crew-call event for a show: the same in every run sheet they get for it. */
export function crewCallUid(showId: string, personId: string, origin: string) {
	return `run-sheet-${showId}-${personId}@${new URL(origin).host}`;
}

function crewCallIcs(
	venue: Venue,
	show: Show,
	p: { personId: string; callAt: Date; position: string },
	sequence: number,
	origin: string,
	cancelled: boolean
) {
	return zonedEventCalendar({
		uid: crewCallUid(show.id, p.personId, origin),
		start: p.callAt,
		end: show.doorsClose > p.callAt ? show.doorsClose : new Date(p.callAt.getTime() + 3_600_000),
		timeZone: venue.timeZone,
		summary: `Crew call: ${p.position}, ${venue.name}`,
		location: venue.address,
		description: showTimesText({ ...show, crewCall: p.callAt }, venue.timeZone, venue.clock),
		url: runSheetUrl(origin, venue.slug, show.id, p.personId),
		sequence,
		cancelled
	});
}

/** The newest run-sheet revision each person got for a show. */
export async function latestSends(db: Db, showId: string) {
	const rows = await db
		.select()
		.from(runSheetSends)
		.where(eq(runSheetSends.showId, showId))
		.orderBy(desc(runSheetSends.revision));
	const latest = new Map<string, SendRow>();
	for (const r of rows) if (!latest.has(r.personId)) latest.set(r.personId, r);
	return latest;
}

export interface QueueResult {
	queued: number;
	/** People who already have this version. */
	unchanged: number;
	/** Nothing was sent because the show is not on. */
	notOn?: boolean;
}

/**
 * Queue run sheets for a show, one message per person, each with their crew call as an ICS file.
 * - 'send' (by hand) and 'auto' (before crew call) send to everyone who does not yet have the
 *   current version; 'auto' leaves alone anyone who already got a run sheet for the show.
 * - 'change' sends only once run sheets went out: a changed run sheet to each person whose sheet
 *   changed, their first one to people assigned since, and a notice to people taken off.
 * A revision is recorded per person before its message is queued; the unique revision and the
 * mail dedupe key (revision and content hash) keep two servers from sending one version twice.
 */
export async function queueRunSheets(
	db: Db,
	o: {
		venueId: string;
		showId: string;
		reason: SendReason;
		origin: string;
		actorId?: string | null;
	}
): Promise<QueueResult> {
	const latest = await latestSends(db, o.showId);
	// Until run sheets went out there is nothing to tell about a change (and nothing to build).
	if (o.reason === 'change' && latest.size === 0) return { queued: 0, unchanged: 0 };
	const built = await buildShowRunSheets(db, o.venueId, o.showId, o.origin);
	if (!built) return { queued: 0, unchanged: 0 };
	const { venue, show, sheets } = built;
	const on = show.status === 'scheduled';
	if (!on && o.reason !== 'change') return { queued: 0, unchanged: 0, notOn: true };

	let queued = 0;
	let unchanged = 0;
	const record = async (
		personId: string,
		contentHash: string,
		snapshot: SheetSummary,
		prev: SendRow | undefined
	) => {
		const revision = (prev?.revision ?? 0) + 1;
		// Calendar programs replace an event only when SEQUENCE goes up (RFC 5545 §3.8.7.4).
		const sequence = Math.max(show.sequence, (prev?.sequence ?? -1) + 1);
		const [row] = await db
			.insert(runSheetSends)
			.values({
				venueId: venue.id,
				showId: show.id,
				personId,
				contentHash,
				revision,
				sequence,
				snapshot,
				reason: o.reason,
				queuedBy: o.actorId ?? null
			})
			.onConflictDoNothing()
			.returning();
		return row ?? null;
	};
	const send = async (
		row: SendRow,
		email: string,
		mail: { subject: string; html: string; text: string },
		ics: string
	) => {
		let message;
		try {
			message = await queueMail(db, {
				venueId: venue.id,
				kind: 'run_sheet',
				subjectId: show.id,
				version: `r${row.revision}-${row.contentHash}`,
				recipient: email,
				...mail,
				attachments: [
					{
						filename: 'crew-call.ics',
						contentType: 'text/calendar; charset=utf-8; method=PUBLISH',
						content: ics
					}
				],
				queuedBy: o.actorId ?? null
			});
		} catch (e) {
			// Without its message the revision would read as sent: drop it so the next try sends.
			await db.delete(runSheetSends).where(eq(runSheetSends.id, row.id));
			throw e;
		}
		await db
			.update(runSheetSends)
			.set({ mailMessageId: message.id })
			.where(eq(runSheetSends.id, row.id));
		queued++;
	};

	for (const sheet of sheets) {
		const prev = latest.get(sheet.personId);
		if (prev && prev.contentHash === sheet.contentHash) {
			unchanged++;
			continue;
		}
		if (o.reason === 'auto' && prev) continue;
		// A show that is off: only people who were told about it hear that it is off.
		if (!on && (!prev || !prev.snapshot.assigned)) continue;
		const changes: SheetChange[] | undefined =
			prev && o.reason !== 'auto'
				? sheetChanges(prev.snapshot, sheet.summary, venue.clock)
				: undefined;
		const row = await record(sheet.personId, sheet.contentHash, sheet.summary, prev);
		if (!row) continue; // another server took this revision
		const ics = crewCallIcs(
			venue,
			show,
			{ ...sheet, position: sheet.data.position },
			row.sequence,
			o.origin,
			!on
		);
		const mail = on
			? renderRunSheet({ ...sheet.data, changes: changes?.length ? changes : undefined })
			: renderScheduleChange({
					venueName: venue.name,
					dateLabel: sheet.data.dateLabel,
					person: sheet.data.person,
					changes: changes ?? [],
					note: 'You are not needed for this night.',
					url: sheet.data.url
				});
		await send(row, sheet.email, mail, ics);
	}

	if (o.reason === 'change') {
		// People taken off the show after they got a run sheet.
		const still = new Set(sheets.map((s) => s.personId));
		const gone = [...latest.values()].filter((r) => !still.has(r.personId) && r.snapshot.assigned);
		if (gone.length) {
			// Someone who left the venue hears nothing more from it.
			const people = await db
				.select({ id: users.id, name: users.name, email: users.email })
				.from(users)
				.innerJoin(
					memberships,
					and(eq(memberships.personId, users.id), eq(memberships.venueId, venue.id))
				)
				.where(
					inArray(
						users.id,
						gone.map((g) => g.personId)
					)
				);
			for (const prev of gone) {
				const person = people.find((p) => p.id === prev.personId);
				if (!person) continue;
				const snapshot: SheetSummary = { ...prev.snapshot, assigned: false };
				const row = await record(prev.personId, 'not-assigned', snapshot, prev);
				if (!row) continue;
				const mail = renderScheduleChange({
					venueName: venue.name,
					dateLabel: localDay(show.date),
					person: { name: person.name ?? person.email },
					changes: sheetChanges(prev.snapshot, snapshot, venue.clock),
					note: 'You are no longer on the crew for this night; the crew call in your calendar is cancelled.'
				});
				const ics = crewCallIcs(
					venue,
					show,
					{ personId: prev.personId, callAt: show.crewCall, position: prev.snapshot.position },
					row.sequence,
					o.origin,
					true
				);
				await send(row, person.email, mail, ics);
			}
		}
	}
	return { queued, unchanged };
}

export interface DeliveryRow {
	personId: string;
	name: string;
	email: string;
	revision: number;
	reason: SendReason;
	messageId: string | null;
	status: MailStatus;
	attempts: number;
	lastError: string | null;
	queuedAt: Date;
	sentAt: Date | null;
}

/** Each person's newest run-sheet message for a show and where it is: queued, sent or failed. */
export async function runSheetDelivery(db: Db, venueId: string, showId: string) {
	const rows = await db
		.select({
			personId: runSheetSends.personId,
			name: users.name,
			email: users.email,
			revision: runSheetSends.revision,
			reason: runSheetSends.reason,
			createdAt: runSheetSends.createdAt,
			messageId: mailMessages.id,
			status: mailMessages.status,
			attempts: mailMessages.attempts,
			lastError: mailMessages.lastError,
			sentAt: mailMessages.sentAt
		})
		.from(runSheetSends)
		.innerJoin(users, eq(users.id, runSheetSends.personId))
		.leftJoin(mailMessages, eq(mailMessages.id, runSheetSends.mailMessageId))
		.where(and(eq(runSheetSends.venueId, venueId), eq(runSheetSends.showId, showId)))
		.orderBy(desc(runSheetSends.revision));
	const latest = new Map<string, DeliveryRow>();
	for (const r of rows) {
		if (latest.has(r.personId)) continue;
		latest.set(r.personId, {
			personId: r.personId,
			name: r.name ?? r.email,
			email: r.email,
			revision: r.revision,
			reason: r.reason,
			messageId: r.messageId,
			status: r.status ?? 'queued',
			attempts: r.attempts ?? 0,
			lastError: r.lastError,
			queuedAt: r.createdAt,
			sentAt: r.sentAt
		});
	}
	const people = [...latest.values()].sort((a, b) => a.name.localeCompare(b.name));
	return {
		people,
		sent: people.filter((p) => p.status === 'sent').length,
		failed: people.filter((p) => p.status === 'failed').length,
		total: people.length
	};
}

/**
 * The periodic sweep: run sheets for shows whose crew call falls within each venue's lead time
 * and that have none yet, and change notices for shows still to come whose sheets went out.
 * Returns the shows it queued mail for.
 */
export async function sweepRunSheets(db: Db, now: Date, origin: string) {
	const due = await db
		.select({ id: shows.id, venueId: shows.venueId })
		.from(shows)
		.innerJoin(venues, eq(venues.id, shows.venueId))
		.where(
			and(
				eq(shows.status, 'scheduled'),
				gt(venues.runSheetLeadHours, 0),
				gt(shows.crewCall, now),
				lte(
					shows.crewCall,
					sql`${now.toISOString()}::timestamptz + make_interval(hours => ${venues.runSheetLeadHours})`
				),
				sql`not exists (select 1 from ${runSheetSends} where ${runSheetSends.showId} = ${shows.id})`
			)
		);
	const sentShows = await db
		.selectDistinct({ id: shows.id, venueId: shows.venueId })
		.from(shows)
		.innerJoin(runSheetSends, eq(runSheetSends.showId, shows.id))
		.where(gt(shows.doorsClose, now));
	const touched: { showId: string; reason: SendReason; queued: number }[] = [];
	for (const s of due) {
		const r = await queueRunSheets(db, {
			venueId: s.venueId,
			showId: s.id,
			reason: 'auto',
			origin
		});
		if (r.queued) touched.push({ showId: s.id, reason: 'auto', queued: r.queued });
	}
	for (const s of sentShows) {
		const r = await queueRunSheets(db, {
			venueId: s.venueId,
			showId: s.id,
			reason: 'change',
			origin
		});
		if (r.queued) touched.push({ showId: s.id, reason: 'change', queued: r.queued });
	}
	return touched;
}

/**
 * After a change to a show (times, status, crew, a stand-down): queue change notices to the people
 * affected, if run sheets already went out. Never fails the change itself; the periodic sweep
 * catches anything missed here.
 */
export async function noticeRunSheetChanges(
	db: Db,
	venueId: string,
	showId: string,
	event: { url: URL; locals: { person?: { id: string } | null } }
) {
	try {
		return await queueRunSheets(db, {
			venueId,
			showId,
			reason: 'change',
			origin: config.origin,
			actorId: event.locals.person?.id ?? null
		});
	} catch (e) {
		console.error('[run sheets] change notice', e instanceof Error ? e.message : e);
		return null;
	}
}
