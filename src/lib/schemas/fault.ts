import { z } from 'zod';
import { FAULT_SEVERITIES } from '$lib/faults/downtime';

const optUuid = (error: string) =>
	z.preprocess((v) => (v === '' ? undefined : v), z.uuid({ error }).optional());
const optText = (max: number, what: string) =>
	z.preprocess(
		(v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
		z.string().trim().max(max, `Keep ${what} under ${max} characters.`).optional()
	);

export const faultReportSchema = z.object({
	seen: z
		.string({ error: 'Say what you saw.' })
		.trim()
		.min(3, 'Say what you saw, in a few words.')
		.max(1000, 'Keep it under 1000 characters.'),
	severity: z.enum(FAULT_SEVERITIES, {
		error: 'Pick how bad it is: stops the scene, degraded or cosmetic.'
	}),
	roomId: optUuid('Pick a room from the list.'),
	showId: optUuid('That night is not in the list.'),
	checkId: optUuid('That check is not in the list.'),
	/** A photo uploaded for the night through the checklist's photo upload. */
	photoId: optUuid('Upload the photo again.'),
	/** Use the photo of the failed check this fault is reported from. */
	checkPhoto: z.literal('yes').optional()
});

export const faultRepairSchema = z.object({
	faultId: z.uuid({ error: 'Pick the fault the repair is for.' }),
	action: z
		.string({ error: 'Say what was done.' })
		.trim()
		.min(3, 'Say what was done, in a few words.')
		.max(1000, 'Keep it under 1000 characters.'),
	parts: optText(500, 'the parts'),
	minutes: z.coerce
		.number({ error: 'Give the time spent in minutes, for example 45.' })
		.int('Give whole minutes, for example 45.')
		.min(1, 'Give the time spent: at least 1 minute.')
		.max(10_000, 'Give the time spent in minutes, up to 10000.')
});

export const faultRetestSchema = z.object({
	faultId: z.uuid({ error: 'Pick the fault that was re-tested.' }),
	outcome: z.enum(['pass', 'fail'], { error: 'Say whether the re-test passed.' }),
	note: optText(500, 'the note')
});

export const faultCloseSchema = z.object({
	faultId: z.uuid({ error: 'Pick the fault to close.' }),
	note: optText(500, 'the note')
});
