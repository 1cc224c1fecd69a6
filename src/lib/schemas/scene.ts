import { z } from 'zod';
import { MAX_STROBE_HZ } from '../scenes/timeline';
import { num, optNum, optText, text } from './num';
import { CUE_TYPES, RESPONSE_SHAPES, SCENE_TRIGGERS } from './scene-words';

const optId = (message: string) =>
	z
		.preprocess((v) => (v === '' ? null : v), z.uuid(message).nullable().optional())
		.transform((v) => v ?? null);

const HOUR_MS = 3_600_000;
// A checkbox after a hidden 'false' field sends both values; the last one counts.
const bool = z.preprocess((v) => {
	const last = Array.isArray(v) ? v.at(-1) : v;
	return last === true || last === 'on' || last === 'true';
}, z.boolean()) as unknown as z.ZodType<boolean, unknown>;

function withTriggerRules<
	T extends z.ZodType<{ trigger: string; triggerSensorId: string | null; loopMs: number | null }>
>(schema: T) {
	return schema
		.refine((s) => s.trigger !== 'sensor' || s.triggerSensorId !== null, {
			message: 'Choose the sensor that starts the scene.',
			path: ['triggerSensorId']
		})
		.refine((s) => s.trigger !== 'timer' || (s.loopMs ?? 0) > 0, {
			message: 'Give the time between starts of the loop.',
			path: ['loopMs']
		});
}

const base = {
	name: text('A name', 120),
	roomId: optId('Choose a room from the list.'),
	trigger: z.enum(SCENE_TRIGGERS, { error: 'Choose what starts the scene.' }),
	triggerSensorId: optId('Choose a sensor from the list.'),
	runsOnShowNights: bool.default(true),
	notes: optText(4000)
};

/** Scene details in the JSON API: times in milliseconds. */
export const sceneDetailsSchema = withTriggerRules(
	z.object({
		...base,
		loopMs: optNum('Loop time', { int: true, gt: 0, max: HOUR_MS }),
		lengthMs: num('Length', { int: true, gt: 0, max: HOUR_MS }),
		rearmMs: num('Re-arm time', { int: true, min: 0, max: HOUR_MS })
	})
);
export type SceneDetails = z.infer<typeof sceneDetailsSchema>;

/** Scene details in forms: times in seconds, stored as milliseconds. */
export const sceneFormSchema = z
	.object({
		...base,
		loopS: optNum('Loop time', { kind: 'seconds', gt: 0, max: 3600 }),
		lengthS: num('Length', { kind: 'seconds', gt: 0, max: 3600 }),
		rearmS: num('Re-arm time', { kind: 'seconds', min: 0, max: 3600 })
	})
	.transform(({ loopS, lengthS, rearmS, ...rest }) => ({
		...rest,
		loopMs: loopS === null ? null : Math.round(loopS * 1000),
		lengthMs: Math.round(lengthS * 1000),
		rearmMs: Math.round(rearmS * 1000)
	}))
	.refine((s) => s.trigger !== 'sensor' || s.triggerSensorId !== null, {
		message: 'Choose the sensor that starts the scene.',
		path: ['triggerSensorId']
	})
	.refine((s) => s.trigger !== 'timer' || (s.loopMs ?? 0) > 0, {
		message: 'Give the time between starts of the loop.',
		path: ['loopS']
	});

const level = (label = 'Level') => num(label, { min: 0, max: 1 });
const duration = (label = 'Length') => num(label, { int: true, gt: 0, max: HOUR_MS });

export const cueActionSchema = z.discriminatedUnion(
	'type',
	[
		z.object({ type: z.literal('set'), level: level() }),
		z.object({
			type: z.literal('fade'),
			level: level(),
			durationMs: num('Fade time', { int: true, min: 0, max: HOUR_MS })
		}),
		z.object({ type: z.literal('pulse'), durationMs: duration() }),
		z.object({
			type: z.literal('strobe'),
			rateHz: num('Rate', { gt: 0, max: MAX_STROBE_HZ }),
			durationMs: duration(),
			level: level()
		})
	],
	{ error: `Choose an action: ${CUE_TYPES.join(', ')}.` }
);

/** A cue; an id is kept when it names a cue of this scene, otherwise a new one is made. */
export const cueSchema = z.object({
	id: z.string().max(64).optional(),
	outputId: z.uuid('Choose an output from the list.'),
	startMs: num('Start', { int: true, min: 0, max: HOUR_MS }),
	action: cueActionSchema
});
export type CueInput = z.infer<typeof cueSchema>;

export const responseSchema = z
	.object({
		id: z.string().max(64).optional(),
		sensorId: z.uuid('Choose a sensor from the list.'),
		outputId: z.uuid('Choose an output from the list.'),
		shape: z.enum(RESPONSE_SHAPES, { error: 'Choose a shape.' }).default('rise'),
		threshold: optNum('Threshold', { min: 0, max: 1 }),
		points: z
			.array(z.tuple([level('Depth'), level()]))
			.max(32, 'Use at most 32 points.')
			.nullable()
			.default(null),
		minLevel: level('Low level').default(0),
		maxLevel: level('High level').default(1)
	})
	.refine((r) => r.shape !== 'points' || (r.points?.length ?? 0) >= 2, {
		message: 'Draw at least two points.',
		path: ['points']
	});
export type ResponseInput = z.infer<typeof responseSchema>;

/** The cues and responses of a scene, saved together from the editor. */
export const sceneContentSchema = z.object({
	cues: z.array(cueSchema).max(500, 'A scene holds at most 500 cues.'),
	responses: z.array(responseSchema).max(50, 'A scene holds at most 50 responses.')
});
export type SceneContent = z.infer<typeof sceneContentSchema>;

/** A whole scene in the JSON API: details, and optionally its cues and responses (replaced as given). */
export const sceneBodySchema = z.intersection(
	sceneDetailsSchema,
	z.object({
		cues: sceneContentSchema.shape.cues.optional(),
		responses: sceneContentSchema.shape.responses.optional()
	})
);
export type SceneBody = z.infer<typeof sceneBodySchema>;
