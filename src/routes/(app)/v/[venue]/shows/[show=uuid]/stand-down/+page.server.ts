import { error, fail, redirect } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import { anyUuid } from '$lib/server/db/any';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { props } from '$lib/server/db/schema';
import { config } from '$lib/server/config';
import { standDown, standDownPreview } from '$lib/server/checklists/signoff';
import { currentChecklist } from '$lib/server/checklists/copies';
import { scenesForShow } from '$lib/server/scenes/for-show';
import { getShow } from '$lib/server/schedule/shows';
import { noticeRunSheetChanges } from '$lib/server/runsheets/send';
import { standDownSchema } from '$lib/schemas/checklist';
import { keep, parseForm } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

const SEARCH_FROM = 30;
const LISTED_MATCHES = 50;

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, ...PLANNERS);
	const show = await getShow(db, venue.id, event.params.show);
	if (!show) error(404, 'There is no such show.');
	const [{ view: checklist }, night] = await Promise.all([
		currentChecklist(db, venue, show.id),
		scenesForShow(db, venue.id, show.id)
	]);
	const ids = [...new Set(night.flatMap((s) => s.propIds))];
	const down = new Set(checklist.standDowns.map((d) => d.propId));
	const failing = checklist.checks.filter((c) => c.latest?.outcome === 'fail' && c.propId);
	const rows = ids.length
		? await db
				.select({ id: props.id, name: props.name })
				.from(props)
				.where(and(eq(props.venueId, venue.id), anyUuid(props.id, ids)))
				.orderBy(asc(props.name))
		: [];
	const choices = rows
		.filter((p) => !down.has(p.id))
		.map((p) => ({
			...p,
			failed: failing.filter((c) => c.propId === p.id).map((c) => c.label)
		}));
	// The prop asked for, else the first failing one: a stand-down nearly always follows a failure.
	const asked = event.url.searchParams.get('prop');
	const chosen =
		choices.find((p) => p.id === asked) ?? choices.find((p) => p.failed.length) ?? null;
	// A large venue has thousands of props on a night: past a short list the picker searches by name,
	// and always keeps the failing props and the chosen one in view.
	const q = (event.url.searchParams.get('q') ?? '').trim().slice(0, 100);
	const searchable = choices.length > SEARCH_FROM;
	const needle = q.toLocaleLowerCase();
	const matching = searchable
		? choices.filter((p) => needle !== '' && p.name.toLocaleLowerCase().includes(needle))
		: choices;
	const listed = searchable
		? choices.filter(
				(p) =>
					p.failed.length ||
					p.id === chosen?.id ||
					matching.slice(0, LISTED_MATCHES).some((m) => m.id === p.id)
			)
		: choices;
	const preview =
		chosen && !checklist.signOff
			? await standDownPreview(db, venue, show.id, chosen.id, config.origin)
			: null;
	return {
		show: { id: show.id, date: show.date },
		signed: checklist.signOff !== null,
		choices: listed,
		total: choices.length,
		search: searchable ? { q, matched: matching.length, listed: LISTED_MATCHES } : null,
		chosen: chosen?.id ?? null,
		alreadyDown: checklist.standDowns.find((d) => d.propId === asked)?.propName ?? null,
		preview
	};
};

export const actions: Actions = {
	default: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await getShow(db, venue.id, event.params.show);
		if (!show) return fail(404, { message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, standDownSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await standDown(db, venue, show.id, event.locals.person!.id, parsed.data);
		if (!done.ok)
			return fail(400, { values: keep(parsed.raw), errors: { propId: [done.message] } });
		// Crew who already have a run sheet learn that the prop is held in its safe state tonight.
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		redirect(
			303,
			`/v/${venue.slug}/shows/${show.id}?stood=${parsed.data.propId}#stooddown-heading`
		);
	}
};
