import { z } from 'zod';

const reading = z
	.union([z.number(), z.string().trim(), z.null()])
	.optional()
	.transform((v, ctx) => {
		if (v === undefined || v === null || v === '') return null;
		const n = typeof v === 'number' ? v : Number(v.replace(',', '.'));
		if (!Number.isFinite(n)) {
			ctx.addIssue({ code: 'custom', message: 'Type the reading as a number, like 502.' });
			return z.NEVER;
		}
		return n;
	});

/** One result sent by a phone; the same schema checks the JSON API. */
export const resultSchema = z.object({
	clientId: z.uuid({ error: 'Each result needs its own id from the phone.' }),
	checkId: z.uuid({ error: 'Pick a check.' }),
	outcome: z.enum(['pass', 'fail'], { error: 'Choose pass or fail.' }).optional(),
	idleReading: reading,
	presentReading: reading,
	note: z
		.string()
		.trim()
		.max(2000, 'Keep the note under 2,000 characters.')
		.optional()
		.nullable()
		.transform((v) => v || null),
	/** The id the photo upload answered with; the server looks up its stored key. */
	photoId: z.uuid({ error: 'Upload the photo again.' }).optional().nullable(),
	/** Both readings were taken from the board, as they came (the crew member typed neither). */
	fromBoard: z.boolean({ error: 'Say whether the readings came from the board.' }).optional(),
	/** When the board sent the present reading (the time the board endpoint answered with). */
	boardReadAt: z.iso
		.datetime({ offset: true, error: 'Send the board time as an ISO 8601 date and time.' })
		.optional()
		.nullable(),
	/** When the phone recorded it (ISO 8601 with offset); judged against the server's clock. */
	recordedAt: z.iso
		.datetime({ offset: true, error: 'Send the recorded time as an ISO 8601 date and time.' })
		.optional()
		.nullable()
});
export type ResultInput = z.input<typeof resultSchema>;

export const standDownSchema = z.object({
	propId: z.uuid({ error: 'Pick the prop to stand down.' }),
	reason: z
		.string({ error: 'Say why the prop is stood down.' })
		.trim()
		.min(3, 'Say why the prop is stood down.')
		.max(500, 'Keep the reason under 500 characters.'),
	/** The show manager read the preview and means it. */
	confirm: z.literal('yes', {
		error: 'Tick the box to confirm, after reading what the stand-down will do.'
	})
});

export const restoreSchema = z.object({
	standDownId: z.uuid({ error: 'That stand-down no longer exists.' }),
	reason: z
		.string({ error: 'Say why the prop can run again.' })
		.trim()
		.min(3, 'Say why the prop can run again.')
		.max(500, 'Keep the reason under 500 characters.')
});

export const signOffSchema = z.object({
	/** Keys of the crew problems the show manager acknowledged (checkboxes named ack). */
	ack: z
		.union([z.string().max(300), z.array(z.string().max(300)).max(200)])
		.optional()
		.transform((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v])),
	note: z
		.string()
		.trim()
		.max(1000, 'Keep the note under 1,000 characters.')
		.optional()
		.transform((v) => v || null)
});

export const safetyItemSchema = z.object({
	label: z
		.string({ error: 'Name the item.' })
		.trim()
		.min(3, 'Name the item, like "Exits lit and clear".')
		.max(200, 'Keep it under 200 characters.')
});

export const sceneExclusionSchema = z.object({
	sceneId: z.uuid({ error: 'Pick a scene.' }),
	reason: z
		.string()
		.trim()
		.max(300, 'Keep the reason under 300 characters.')
		.optional()
		.transform((v) => v || null)
});
