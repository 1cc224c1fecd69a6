import { and, eq, inArray } from 'drizzle-orm';
import { applyCurve } from '$lib/curves/curve';
import type { Db } from '$lib/server/db/client';
import { outputs, sceneCues, sceneResponses, scenes } from '$lib/server/db/schema';
import type { Output, Scene } from '$lib/scenes/types';
import type { SceneCheckOptions } from '$lib/scenes/checks';

type OutputRow = typeof outputs.$inferSelect;
type SceneRow = typeof scenes.$inferSelect;
type CueRow = typeof sceneCues.$inferSelect;
type ResponseRow = typeof sceneResponses.$inferSelect;

/** An output row as the scene maths sees it. */
export function toOutputModel(row: OutputRow): Output {
	const s = row.settings;
	if (s.kind === 'led_string') {
		return {
			id: row.id,
			name: row.name,
			kind: 'led',
			currentAtFull: (s.strings * s.currentMa) / 1000,
			safeState: row.safeState
		};
	}
	return {
		id: row.id,
		name: row.name,
		kind: 'relay',
		relayKind: s.relayKind,
		// The coil is what the controller's supply feeds (Ohm's law); the load has its own supply.
		currentAtFull: s.coilV / s.coilOhm,
		safeState: row.safeState,
		minOnMs: s.minOnMs ?? undefined,
		minOffMs: s.minOffMs ?? undefined,
		maxDutyPercent: s.maxDutyPercent ?? undefined
	};
}

/** A scene and its rows as the scene maths sees them. */
export function toSceneModel(scene: SceneRow, cues: CueRow[], responses: ResponseRow[]): Scene {
	return {
		lengthMs: scene.lengthMs,
		rearmMs: scene.rearmMs,
		cues: cues.map((c) => ({
			id: c.id,
			outputId: c.outputId,
			startMs: c.startMs,
			action: c.action
		})),
		responses: responses.map((r) => ({
			id: r.id,
			sensorId: r.sensorId,
			outputId: r.outputId,
			shape: r.shape,
			threshold: r.threshold,
			points: r.points,
			minLevel: r.minLevel,
			maxLevel: r.maxLevel
		}))
	};
}

/** An LED's light at a level goes through its brightness curve: the duty is the relative luminance. */
export function luminanceThroughCurves(rows: OutputRow[]): SceneCheckOptions['luminance'] {
	const curves = new Map(rows.map((r) => [r.id, r.curve]));
	return (output, level) => {
		const curve = curves.get(output.id);
		return curve ? applyCurve(curve, level) : level;
	};
}

export interface LoadedScene {
	row: SceneRow;
	cues: CueRow[];
	responses: ResponseRow[];
	outputRows: OutputRow[];
	scene: Scene;
	outputs: Output[];
}

/** One scene with its cues, responses and the outputs they use, or null when it is not in the venue. */
export async function loadScene(
	db: Db,
	venueId: string,
	sceneId: string
): Promise<LoadedScene | null> {
	const [row] = await db
		.select()
		.from(scenes)
		.where(and(eq(scenes.id, sceneId), eq(scenes.venueId, venueId)));
	if (!row) return null;
	const [cues, responses] = await Promise.all([
		db.select().from(sceneCues).where(eq(sceneCues.sceneId, row.id)).orderBy(sceneCues.startMs),
		db.select().from(sceneResponses).where(eq(sceneResponses.sceneId, row.id))
	]);
	const outputIds = [...new Set([...cues, ...responses].map((x) => x.outputId))];
	const outputRows =
		outputIds.length === 0
			? []
			: await db
					.select()
					.from(outputs)
					.where(and(eq(outputs.venueId, venueId), inArray(outputs.id, outputIds)));
	return {
		row,
		cues,
		responses,
		outputRows,
		scene: toSceneModel(row, cues, responses),
		outputs: outputRows.map(toOutputModel)
	};
}
