import { z } from 'zod';

export const roomSchema = z.object({
	name: z
		.string({ error: 'Name the room.' })
		.trim()
		.min(1, 'Name the room.')
		.max(80, 'Use at most 80 characters.'),
	notes: z
		.string()
		.trim()
		.max(1000, 'Use at most 1000 characters.')
		.optional()
		.transform((v) => (v ? v : null))
});

export const roomIdSchema = z.object({ id: z.uuid('That room does not exist.') });
