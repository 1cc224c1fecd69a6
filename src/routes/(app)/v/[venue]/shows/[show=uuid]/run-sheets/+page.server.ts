import { fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { runSheetSends } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { findMail } from '$lib/server/mail/outbox';
import { resendMail } from '$lib/server/mail/queue';
import { visibleRunSheets } from '$lib/server/runsheets/access';
import { queueRunSheets, runSheetDelivery } from '$lib/server/runsheets/send';
import { isMemberAddress } from '$lib/server/venues/members';
import { resendSchema } from '$lib/schemas/mail';
import { localDay } from '$lib/util/when';
import type { Actions, PageServerLoad } from './$types';
import { config } from '$lib/server/config';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const person = event.locals.person!;
	const { show, sheets, planner } = await visibleRunSheets(
		venue,
		person.id,
		event.params.show,
		config.origin
	);
	return {
		show: { id: show.id, date: show.date, dateLabel: localDay(show.date), status: show.status },
		sheets: sheets.map((s) => ({ personId: s.personId, name: s.name, data: s.data })),
		delivery: planner ? await runSheetDelivery(db, venue.id, show.id) : null,
		canSend: planner
	};
};

export const actions: Actions = {
	send: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const person = event.locals.person!;
		const { show, sheets } = await visibleRunSheets(
			venue,
			person.id,
			event.params.show,
			config.origin
		);
		if (show.status !== 'scheduled')
			return fail(400, { sendError: 'This show is not on, so there are no run sheets to send.' });
		if (!sheets.length)
			return fail(400, { sendError: 'Nobody is assigned to this show yet: assign crew first.' });
		let result;
		try {
			result = await queueRunSheets(db, {
				venueId: venue.id,
				showId: show.id,
				reason: 'send',
				origin: config.origin,
				actorId: person.id
			});
		} catch (e) {
			console.error('queuing run sheets failed', e);
			return fail(503, { sendError: 'The run sheets could not be queued. Try again in a minute.' });
		}
		await audit(db, {
			venueId: venue.id,
			personId: person.id,
			action: 'run_sheets.sent',
			detail: { show: show.id, date: show.date, queued: result.queued, unchanged: result.unchanged }
		});
		return { queued: result.queued, unchanged: result.unchanged };
	},
	retry: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const person = event.locals.person!;
		const parsed = await parseForm(event.request, resendSchema);
		if (!parsed.ok) return fail(400, { sendError: 'That message does not exist.' });
		const original = await findMail(db, venue.id, parsed.data.id);
		if (!original || original.kind !== 'run_sheet' || original.subjectId !== event.params.show)
			return fail(400, { sendError: 'That message does not exist.' });
		if (!(await isMemberAddress(db, venue.id, original.recipient)))
			return fail(400, {
				sendError: `${original.recipient} no longer belongs to this venue, so the run sheet was not sent again.`
			});
		let fresh;
		try {
			fresh = await resendMail(db, original, person.id);
		} catch (e) {
			console.error('run sheet re-send failed', e);
			return fail(503, {
				sendError: `The run sheet to ${original.recipient} could not be queued again.`
			});
		}
		// The person's delivery status follows the new message.
		await db
			.update(runSheetSends)
			.set({ mailMessageId: fresh.id })
			.where(
				and(eq(runSheetSends.venueId, venue.id), eq(runSheetSends.mailMessageId, original.id))
			);
		await audit(db, {
			venueId: venue.id,
			personId: person.id,
			action: 'mail.resent',
			detail: { to: original.recipient, subject: original.subject }
		});
		return { retried: original.recipient };
	}
};
