import { z } from 'zod';
import { optText, text } from './num';
import { OUTPUT_KINDS, PROP_STATUSES, SENSOR_KINDS } from './prop-words';

const optId = (message: string) =>
	z
		.preprocess((v) => (v === '' ? null : v), z.uuid(message).nullable().optional())
		.transform((v) => v ?? null);

export const propSchema = z.object({
	name: text('A name', 120),
	roomId: optId('Choose a room from the list.'),
	controllerId: optId('Choose a controller from the list.'),
	status: z.enum(PROP_STATUSES, { error: 'Choose a status.' }).default('design'),
	notes: optText(4000)
});
export type PropInput = z.infer<typeof propSchema>;

export const PROP_SORTS = ['name', 'room', 'status', 'updated'] as const;

/** Query of the props table; anything odd falls back to the default rather than failing. */
export const propQuerySchema = z.object({
	q: z.string().trim().max(120).catch(''),
	room: z.uuid().optional().catch(undefined),
	status: z.enum(PROP_STATUSES).optional().catch(undefined),
	sensor: z.enum(SENSOR_KINDS).optional().catch(undefined),
	output: z.enum(OUTPUT_KINDS).optional().catch(undefined),
	sort: z.enum(PROP_SORTS).catch('name'),
	dir: z.enum(['asc', 'desc']).catch('asc'),
	page: z.coerce.number().int().min(1).max(100000).catch(1)
});
export type PropQuery = z.infer<typeof propQuerySchema>;
