import {
	boolean,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { rooms } from './venues.schema';
import { outputs, props, sensors } from './props.schema';
import { shows } from './schedule.schema';
import type { CueAction } from '../../scenes/types';
import {
	RESPONSE_SHAPES,
	SCENE_TRIGGERS,
	type ResponseShape,
	type SceneTrigger
} from '../../schemas/scene-words';
import { createdAt, venueId } from './columns';

/** How a scene starts: a sensor entering its trigger range, a timer loop, or by hand. */
export { SCENE_TRIGGERS, RESPONSE_SHAPES };
export type { SceneTrigger, ResponseShape };
export const sceneTrigger = pgEnum('scene_trigger', SCENE_TRIGGERS);

/** How a sensor's depth (0..1) becomes an output level before the output's brightness curve. */
export const responseShape = pgEnum('response_shape', RESPONSE_SHAPES);

export const scenes = pgTable(
	'scenes',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		name: text('name').notNull(),
		trigger: sceneTrigger('trigger').notNull().default('manual'),
		/** The sensor whose trigger range starts the scene, when trigger = 'sensor'. */
		triggerSensorId: uuid('trigger_sensor_id').references(() => sensors.id, {
			onDelete: 'set null'
		}),
		/** Milliseconds between starts, when trigger = 'timer'. */
		loopMs: integer('loop_ms'),
		lengthMs: integer('length_ms').notNull(),
		rearmMs: integer('rearm_ms').notNull().default(0),
		/** False: the scene is kept but does not run on show nights (and makes no checks). */
		runsOnShowNights: boolean('runs_on_show_nights').notNull().default(true),
		notes: text('notes'),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('scenes_venue_room').on(t.venueId, t.roomId),
		uniqueIndex('scenes_venue_name').on(t.venueId, t.name)
	]
);

/** One timed action on one output; the lane is the output. */
export const sceneCues = pgTable(
	'scene_cues',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		sceneId: uuid('scene_id')
			.notNull()
			.references(() => scenes.id, { onDelete: 'cascade' }),
		outputId: uuid('output_id')
			.notNull()
			.references(() => outputs.id, { onDelete: 'cascade' }),
		startMs: integer('start_ms').notNull(),
		action: jsonb('action').$type<CueAction>().notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('scene_cues_scene').on(t.sceneId, t.startMs),
		// A venue's cues (wear counters) and an output's cues (the prop page's scenes).
		index('scene_cues_venue_output').on(t.venueId, t.outputId)
	]
);

/** A live link from a sensor's depth to an output's level. */
export const sceneResponses = pgTable(
	'scene_responses',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		sceneId: uuid('scene_id')
			.notNull()
			.references(() => scenes.id, { onDelete: 'cascade' }),
		sensorId: uuid('sensor_id')
			.notNull()
			.references(() => sensors.id, { onDelete: 'cascade' }),
		outputId: uuid('output_id')
			.notNull()
			.references(() => outputs.id, { onDelete: 'cascade' }),
		shape: responseShape('shape').notNull().default('rise'),
		/** Depth at which a 'step' switches. */
		threshold: doublePrecision('threshold'),
		/** Drawn [depth, level] pairs for 'points', depth ascending. */
		points: jsonb('points').$type<[number, number][]>(),
		minLevel: doublePrecision('min_level').notNull().default(0),
		maxLevel: doublePrecision('max_level').notNull().default(1),
		createdAt: createdAt()
	},
	(t) => [
		index('scene_responses_scene').on(t.sceneId),
		// A venue's responses (wear counters), an output's and a sensor's (the prop page's scenes).
		index('scene_responses_venue_output').on(t.venueId, t.outputId),
		index('scene_responses_venue_sensor').on(t.venueId, t.sensorId)
	]
);

/** Scenes left out of one show (by default every scene with runsOnShowNights runs every show). */
export const showSceneExclusions = pgTable(
	'show_scene_exclusions',
	{
		showId: uuid('show_id')
			.notNull()
			.references(() => shows.id, { onDelete: 'cascade' }),
		sceneId: uuid('scene_id')
			.notNull()
			.references(() => scenes.id, { onDelete: 'cascade' }),
		venueId: venueId(),
		reason: text('reason'),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.showId, t.sceneId] })]
);

/**
 * A prop taken out of one show: its scenes hold their outputs in the safe state and the run sheets
 * say so. Written by the show manager before sign-off; never edited, only added. A stand-down is
 * undone by a restore row (below), so a prop may be stood down again later the same night; only
 * one stand-down without a restore per show and prop, kept under the show's lock.
 */
export const standDowns = pgTable(
	'stand_downs',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		showId: uuid('show_id')
			.notNull()
			.references(() => shows.id, { onDelete: 'cascade' }),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		reason: text('reason').notNull(),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('stand_downs_show_prop').on(t.showId, t.propId)]
);

/** A stand-down undone by a show manager before sign-off, with their reason. Never edited. */
export const standDownRestores = pgTable('stand_down_restores', {
	id: uuid('id').primaryKey().defaultRandom(),
	venueId: venueId(),
	standDownId: uuid('stand_down_id')
		.notNull()
		.unique()
		.references(() => standDowns.id, { onDelete: 'cascade' }),
	reason: text('reason').notNull(),
	personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
	at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
});

/**
 * A scene's change history: who changed what, when. Never edited, only added, so a change made
 * after a night was signed off shows against that sign-off's time.
 */
export const sceneChanges = pgTable(
	'scene_changes',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		sceneId: uuid('scene_id')
			.notNull()
			.references(() => scenes.id, { onDelete: 'cascade' }),
		personId: text('person_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
		/** One line for people, e.g. "Moved a cue on Warm lanterns; changed the re-arm time". */
		summary: text('summary').notNull(),
		/** What changed, field by field: { fields: [...], cues: {added, removed, changed}, responses: {...} }. */
		detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({})
	},
	(t) => [index('scene_changes_scene').on(t.sceneId, t.at)]
);
