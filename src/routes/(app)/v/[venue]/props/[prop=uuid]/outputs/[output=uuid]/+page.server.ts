import { fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { outputs } from '$lib/server/db/schema';
import { errorsByPath, parseNestedForm, readForm } from '$lib/server/props/form';
import { findOutput } from '$lib/server/props/outputs';
import { flatValues, outputValues, touchProp } from '$lib/server/props/records';
import { hazardsOf } from '$lib/props/output-maths';
import { curveSchema, outputSchema } from '$lib/schemas/output';
import { checkReason, lastSignedNight, recordChange } from '$lib/server/changes/records';
import { localDay } from '$lib/util/when';
import { curveDifferences, outputDifferences, outputState } from '$lib/props/changes';
import { maintenanceRecords, wearSettings } from '$lib/server/db/schema';
import { maintenanceHistory, outputWear, wearSettingOf } from '$lib/server/wear/records';
import { parseForm, keep } from '$lib/server/forms';
import { maintenanceSchema, wearSettingSchema } from '$lib/schemas/wear';
import { wearKindFor } from '$lib/wear/counters';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const found = await findOutput(db, venue.id, event.params.prop, event.params.output);
	const [signed, setting, [wear], maintenance] = await Promise.all([
		lastSignedNight(db, venue.id, found.prop.id),
		wearSettingOf(db, venue.id, found.output.id),
		outputWear(db, venue.id, [found.output.id]),
		maintenanceHistory(db, venue.id, found.output.id)
	]);
	return {
		wear: {
			setting: setting
				? { kind: setting.kind, ratedLife: setting.ratedLife, interval: setting.interval }
				: null,
			suggestedKind: wearKindFor(found.output.relayKind),
			counter: wear?.counter ?? null,
			maintenance: maintenance.slice(0, 10).map((m) => ({ ...m, at: m.at.toISOString() }))
		},
		...found,
		formValues: flatValues(
			{
				name: found.output.name,
				safeState: found.output.safeState,
				settings: found.output.settings
			},
			['settings']
		),
		hazards: hazardsOf(found.output),
		signedNight: signed ? localDay(signed.date) : null,
		canEdit: EDITORS.includes(venue.role)
	};
};

/** Points come from the form as lines of "level, duty". */
function parsePoints(text: string) {
	return text
		.split(/\r?\n/)
		.map((l) => l.trim())
		.filter(Boolean)
		.map((l) => {
			const [x, y] = l.split(/[,;\s]+/);
			return { x, y };
		});
}

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const parsed = await parseNestedForm(event.request, outputSchema);
		if (!parsed.ok) return fail(400, { action: 'save', values: parsed.raw, errors: parsed.errors });
		const values = outputValues(parsed.data);
		const diffs = outputDifferences(output, values);
		const gate = await checkReason(db, venue.id, prop.id, diffs, parsed.raw);
		if (!gate.ok) return fail(400, { action: 'save', values: parsed.raw, errors: gate.errors });
		await db.transaction(async (tx) => {
			await tx
				.update(outputs)
				.set({
					...values,
					curve: values.kind === 'led_string' ? (output.curve ?? { kind: 'cie' }) : null
				})
				.where(and(eq(outputs.id, output.id), eq(outputs.venueId, venue.id)));
			if (gate.reason)
				await recordChange(tx, {
					venueId: venue.id,
					propId: prop.id,
					outputId: output.id,
					part: 'output',
					partName: values.name,
					diffs,
					oldValue: outputState(output),
					newValue: outputState(values),
					reason: gate.reason,
					personId: event.locals.person!.id
				});
		});
		await touchProp(db, venue.id, prop.id);
		return { action: 'save', saved: true };
	},
	curve: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const raw = await readForm(event.request);
		const candidate =
			raw.kind === 'points'
				? { kind: 'points', points: parsePoints(raw.points ?? '') }
				: raw.kind === 'gamma'
					? { kind: 'gamma', exponent: raw.exponent }
					: { kind: raw.kind };
		const parsed = curveSchema.safeParse(candidate);
		if (!parsed.success)
			return fail(400, {
				action: 'curve',
				values: raw,
				errors: errorsByPath(parsed.error) as Record<string, string[]>
			});
		if (output.kind !== 'led_string')
			return fail(400, {
				action: 'curve',
				values: raw,
				errors: { kind: ['Only LED strings have a brightness curve.'] } as Record<string, string[]>
			});
		const diffs = curveDifferences(output.curve, parsed.data);
		const gate = await checkReason(db, venue.id, prop.id, diffs, raw);
		if (!gate.ok) return fail(400, { action: 'curve', values: raw, errors: gate.errors });
		await db.transaction(async (tx) => {
			await tx
				.update(outputs)
				.set({ curve: parsed.data })
				.where(and(eq(outputs.id, output.id), eq(outputs.venueId, venue.id)));
			if (gate.reason)
				await recordChange(tx, {
					venueId: venue.id,
					propId: prop.id,
					outputId: output.id,
					part: 'curve',
					partName: output.name,
					diffs,
					oldValue: { curve: output.curve },
					newValue: { curve: parsed.data },
					reason: gate.reason,
					personId: event.locals.person!.id
				});
		});
		await touchProp(db, venue.id, prop.id);
		return { action: 'curve', saved: true };
	},
	wear: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const parsed = await parseForm(event.request, wearSettingSchema);
		if (!parsed.ok)
			return fail(400, { action: 'wear', values: keep(parsed.raw), errors: parsed.errors });
		// Append-only: the latest setting counts.
		await db.insert(wearSettings).values({
			venueId: venue.id,
			outputId: output.id,
			...parsed.data,
			personId: event.locals.person!.id
		});
		return { action: 'wear', saved: true };
	},
	maintained: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const parsed = await parseForm(event.request, maintenanceSchema);
		if (!parsed.ok)
			return fail(400, { action: 'maintained', values: keep(parsed.raw), errors: parsed.errors });
		await db.insert(maintenanceRecords).values({
			venueId: venue.id,
			outputId: output.id,
			note: parsed.data.note,
			personId: event.locals.person!.id
		});
		return { action: 'maintained', saved: true };
	}
};
