import { and, asc, eq, gt, inArray, notInArray } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import {
	outputs,
	props,
	sceneChanges,
	sceneCues,
	sceneResponses,
	scenes,
	sensors,
	showSceneExclusions,
	standDowns
} from '$lib/server/db/schema';

export interface ShowScene {
	id: string;
	name: string;
	roomId: string | null;
	/** Props whose sensors or outputs the scene uses. */
	propIds: string[];
	/** True when one of those props is stood down for the show: the scene holds its safe state. */
	stoodDown: boolean;
}

/**
 * The scenes that run on one show: every scene of the venue marked to run on show nights, less the
 * ones left out of this show. Each comes with the props it uses, found through its cues, responses
 * and trigger sensor.
 */
export async function scenesForShow(db: Db, venueId: string, showId: string): Promise<ShowScene[]> {
	const excluded = db
		.select({ id: showSceneExclusions.sceneId })
		.from(showSceneExclusions)
		.where(eq(showSceneExclusions.showId, showId));
	const rows = await db
		.select({
			id: scenes.id,
			name: scenes.name,
			roomId: scenes.roomId,
			trigger: scenes.triggerSensorId
		})
		.from(scenes)
		.where(
			and(
				eq(scenes.venueId, venueId),
				eq(scenes.runsOnShowNights, true),
				notInArray(scenes.id, excluded)
			)
		)
		.orderBy(scenes.name);
	if (rows.length === 0) return [];
	const ids = rows.map((r) => r.id);

	const [cueProps, responseSensorProps, responseOutputProps, triggerProps, down] =
		await Promise.all([
			db
				.selectDistinct({ sceneId: sceneCues.sceneId, propId: outputs.propId })
				.from(sceneCues)
				.innerJoin(outputs, eq(outputs.id, sceneCues.outputId))
				.where(inArray(sceneCues.sceneId, ids)),
			db
				.selectDistinct({ sceneId: sceneResponses.sceneId, propId: sensors.propId })
				.from(sceneResponses)
				.innerJoin(sensors, eq(sensors.id, sceneResponses.sensorId))
				.where(inArray(sceneResponses.sceneId, ids)),
			db
				.selectDistinct({ sceneId: sceneResponses.sceneId, propId: outputs.propId })
				.from(sceneResponses)
				.innerJoin(outputs, eq(outputs.id, sceneResponses.outputId))
				.where(inArray(sceneResponses.sceneId, ids)),
			db
				.select({ sceneId: scenes.id, propId: sensors.propId })
				.from(scenes)
				.innerJoin(sensors, eq(sensors.id, scenes.triggerSensorId))
				.where(inArray(scenes.id, ids)),
			db
				.select({ propId: standDowns.propId })
				.from(standDowns)
				.innerJoin(props, eq(props.id, standDowns.propId))
				.where(and(eq(standDowns.showId, showId), eq(standDowns.venueId, venueId)))
		]);

	const stood = new Set(down.map((d) => d.propId));
	const bySceneId = new Map<string, Set<string>>(ids.map((id) => [id, new Set()]));
	for (const link of [
		...cueProps,
		...responseSensorProps,
		...responseOutputProps,
		...triggerProps
	]) {
		bySceneId.get(link.sceneId)?.add(link.propId);
	}
	return rows.map((r) => {
		const propIds = [...(bySceneId.get(r.id) ?? [])];
		return {
			id: r.id,
			name: r.name,
			roomId: r.roomId,
			propIds,
			stoodDown: propIds.some((id) => stood.has(id))
		};
	});
}

export interface ChangeAfterSignOff {
	sceneId: string;
	sceneName: string;
	summary: string;
	personId: string | null;
	at: Date;
}

/**
 * Changes to a night's scenes made after the night was signed off, oldest first: the sign-off
 * vouched for the scenes as they were, so these are what nobody has checked.
 */
export async function changesAfterSignOff(
	db: Db,
	venueId: string,
	sceneIds: string[],
	signedAt: Date
): Promise<ChangeAfterSignOff[]> {
	if (sceneIds.length === 0) return [];
	return db
		.select({
			sceneId: sceneChanges.sceneId,
			sceneName: scenes.name,
			summary: sceneChanges.summary,
			personId: sceneChanges.personId,
			at: sceneChanges.at
		})
		.from(sceneChanges)
		.innerJoin(scenes, eq(scenes.id, sceneChanges.sceneId))
		.where(
			and(
				eq(sceneChanges.venueId, venueId),
				inArray(sceneChanges.sceneId, sceneIds),
				gt(sceneChanges.at, signedAt)
			)
		)
		.orderBy(asc(sceneChanges.at));
}
