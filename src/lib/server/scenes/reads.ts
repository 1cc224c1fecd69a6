/** Reading scenes: what a venue offers a scene, the scene list, analyses, history and JSON. */
import { and, asc, desc, eq } from 'drizzle-orm';
import { anyUuid } from '$lib/server/db/any';
import type { Db } from '$lib/server/db/client';
import {
	controllers,
	outputs,
	props,
	rooms,
	sceneChanges,
	sceneCues,
	sceneResponses,
	scenes,
	sensors,
	users,
	venues
} from '$lib/server/db/schema';
import {
	analyseScene,
	type AnalysisOutput,
	type SceneAnalysis,
	type Supply
} from '$lib/scenes/analysis';
import { hazardsOf } from '$lib/props/output-maths';
import { SAFE_STATE_LABELS } from '$lib/schemas/prop-words';
import type { Scene } from '$lib/scenes/types';
import { loadScene, toOutputModel, toSceneModel, type LoadedScene } from './model';

/** An output as the scene editor and analysis see it. */
export interface SceneOutput extends AnalysisOutput {
	propId: string;
	propName: string;
	roomId: string | null;
	relayKind?: AnalysisOutput['relayKind'];
	hazards: string[];
	safeStateLabel: string;
}

export interface SceneSensor {
	id: string;
	name: string;
	kind: string;
	propId: string;
	propName: string;
	roomId: string | null;
}

/** Everything in a venue a scene can use, and the venue's dispatch numbers. */
export async function sceneContext(db: Db, venueId: string) {
	const [venue] = await db
		.select({
			dispatchIntervalS: venues.dispatchIntervalSeconds,
			groupSize: venues.defaultGroupSize
		})
		.from(venues)
		.where(eq(venues.id, venueId));
	const [outputRows, sensorRows, propRows, controllerRows, roomRows] = await Promise.all([
		db.select().from(outputs).where(eq(outputs.venueId, venueId)).orderBy(asc(outputs.name)),
		db.select().from(sensors).where(eq(sensors.venueId, venueId)).orderBy(asc(sensors.name)),
		db.select().from(props).where(eq(props.venueId, venueId)).orderBy(asc(props.name)),
		db.select().from(controllers).where(eq(controllers.venueId, venueId)),
		db
			.select({ id: rooms.id, name: rooms.name })
			.from(rooms)
			.where(eq(rooms.venueId, venueId))
			.orderBy(asc(rooms.position), asc(rooms.name))
	]);
	const propById = new Map(propRows.map((p) => [p.id, p]));
	const sceneOutputs: SceneOutput[] = outputRows.map((row) => {
		const prop = propById.get(row.propId);
		return {
			...toOutputModel(row),
			colour: row.settings.kind === 'led_string' ? row.settings.colour : null,
			curve: row.curve,
			supplyId: prop?.controllerId ?? null,
			propId: row.propId,
			propName: prop?.name ?? '',
			roomId: prop?.roomId ?? null,
			hazards: hazardsOf(row),
			safeStateLabel: SAFE_STATE_LABELS[row.safeState]
		};
	});
	const sceneSensors: SceneSensor[] = sensorRows.map((s) => ({
		id: s.id,
		name: s.name,
		kind: s.kind,
		propId: s.propId,
		propName: propById.get(s.propId)?.name ?? '',
		roomId: propById.get(s.propId)?.roomId ?? null
	}));
	const supplies: Supply[] = controllerRows.map((c) => ({
		id: c.id,
		name: c.name,
		amps: c.supplyRatingA
	}));
	return {
		dispatchIntervalS: venue?.dispatchIntervalS ?? 90,
		groupSize: venue?.groupSize ?? 6,
		outputs: sceneOutputs,
		sensors: sceneSensors,
		supplies,
		rooms: roomRows
	};
}
export type SceneContext = Awaited<ReturnType<typeof sceneContext>>;

/** The checks of a scene model with the venue's outputs, supplies and dispatch numbers. */
export function analyseWith(context: SceneContext, scene: Scene): SceneAnalysis {
	const used = new Set([
		...scene.cues.map((c) => c.outputId),
		...(scene.responses ?? []).map((r) => r.outputId)
	]);
	return analyseScene(
		scene,
		context.outputs.filter((o) => used.has(o.id)),
		{
			supplies: context.supplies,
			dispatchIntervalS: context.dispatchIntervalS,
			groupSize: context.groupSize
		}
	);
}

/** One scene's analysis, or null when it is not in the venue (for run sheets and checklists too). */
export async function sceneAnalysis(
	db: Db,
	venueId: string,
	sceneId: string
): Promise<SceneAnalysis | null> {
	const loaded = await loadScene(db, venueId, sceneId);
	if (!loaded) return null;
	return analyseWith(await sceneContext(db, venueId), loaded.scene);
}

/** Every scene of a venue with its room, counts and warnings, for the scene list. */
export async function listScenes(db: Db, venueId: string) {
	const [rows, cues, responses, context] = await Promise.all([
		db.select().from(scenes).where(eq(scenes.venueId, venueId)).orderBy(asc(scenes.name)),
		db.select().from(sceneCues).where(eq(sceneCues.venueId, venueId)),
		db.select().from(sceneResponses).where(eq(sceneResponses.venueId, venueId)),
		sceneContext(db, venueId)
	]);
	return {
		rooms: context.rooms,
		scenes: rows.map((row) => {
			const c = cues.filter((x) => x.sceneId === row.id);
			const r = responses.filter((x) => x.sceneId === row.id);
			const analysis = analyseWith(context, toSceneModel(row, c, r));
			return {
				id: row.id,
				name: row.name,
				roomId: row.roomId,
				trigger: row.trigger,
				lengthMs: row.lengthMs,
				rearmMs: row.rearmMs,
				runsOnShowNights: row.runsOnShowNights,
				updatedAt: row.updatedAt,
				cueCount: c.length,
				responseCount: r.length,
				errors: analysis.errors,
				warnings: analysis.warnings,
				needsStrobeSignage: analysis.needsStrobeSignage
			};
		})
	};
}

/** A scene's change history, newest first, with who made each change. */
export async function sceneHistory(db: Db, venueId: string, sceneId: string) {
	return db
		.select({
			id: sceneChanges.id,
			at: sceneChanges.at,
			summary: sceneChanges.summary,
			personName: users.name,
			personEmail: users.email
		})
		.from(sceneChanges)
		.leftJoin(users, eq(users.id, sceneChanges.personId))
		.where(and(eq(sceneChanges.venueId, venueId), eq(sceneChanges.sceneId, sceneId)))
		.orderBy(desc(sceneChanges.at))
		.limit(100);
}

/** A scene's details as a save takes them (times in milliseconds). */
export function sceneDetailsOf(row: LoadedScene['row']) {
	return {
		name: row.name,
		roomId: row.roomId,
		trigger: row.trigger,
		triggerSensorId: row.triggerSensorId,
		loopMs: row.loopMs,
		lengthMs: row.lengthMs,
		rearmMs: row.rearmMs,
		runsOnShowNights: row.runsOnShowNights,
		notes: row.notes
	};
}

/** A scene as the JSON API gives it: details in milliseconds, cues and responses. */
export function sceneJson(loaded: LoadedScene) {
	const { row, cues, responses } = loaded;
	return {
		id: row.id,
		...sceneDetailsOf(row),
		updatedAt: row.updatedAt,
		cues: cues.map(({ id, outputId, startMs, action }) => ({ id, outputId, startMs, action })),
		responses: responses.map(
			({ id, sensorId, outputId, shape, threshold, points, minLevel, maxLevel }) => ({
				id,
				sensorId,
				outputId,
				shape,
				threshold,
				points,
				minLevel,
				maxLevel
			})
		)
	};
}

/** Scenes that use any of these outputs (for a prop page's "Scenes" links). */
export async function scenesUsingOutputs(db: Db, venueId: string, outputIds: string[]) {
	if (!outputIds.length) return [];
	// Both at once, each through its (venue_id, output_id) index; the ids as one array parameter.
	const [rows, viaResponses] = await Promise.all([
		db
			.selectDistinct({ id: scenes.id, name: scenes.name })
			.from(scenes)
			.innerJoin(sceneCues, eq(sceneCues.sceneId, scenes.id))
			.where(
				and(
					eq(scenes.venueId, venueId),
					eq(sceneCues.venueId, venueId),
					anyUuid(sceneCues.outputId, outputIds)
				)
			),
		db
			.selectDistinct({ id: scenes.id, name: scenes.name })
			.from(scenes)
			.innerJoin(sceneResponses, eq(sceneResponses.sceneId, scenes.id))
			.where(
				and(
					eq(scenes.venueId, venueId),
					eq(sceneResponses.venueId, venueId),
					anyUuid(sceneResponses.outputId, outputIds)
				)
			)
	]);
	const all = new Map([...rows, ...viaResponses].map((r) => [r.id, r]));
	return [...all.values()].sort((a, b) => a.name.localeCompare(b.name));
}
