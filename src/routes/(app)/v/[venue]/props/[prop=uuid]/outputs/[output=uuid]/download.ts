import { error, type RequestEvent } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { findOutput } from '$lib/server/props/outputs';
import { levelTableFor } from '$lib/props/level-table';

/** The level table of an LED output, for the three download routes. */
export async function levelTableDownload(
	event: RequestEvent<{ venue: string; prop: string; output: string }>
) {
	const venue = requireRole(event);
	const { output, controller } = await findOutput(
		db,
		venue.id,
		event.params.prop,
		event.params.output
	);
	if (output.kind !== 'led_string' || !output.curve)
		error(404, 'Only LED string outputs have a level table.');
	const result = levelTableFor(output.curve, controller);
	if (!result.ok) error(400, `The brightness curve cannot be used: ${result.problems.join('; ')}`);
	const slug =
		output.name
			.toLowerCase()
			.replace(/[^a-z0-9]+/g, '-')
			.replace(/^-|-$/g, '') || 'output';
	return { table: result.table, name: output.name, slug };
}
