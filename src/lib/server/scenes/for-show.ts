import { and, asc, eq, gt, inArray, isNotNull, notInArray, sql } from 'drizzle-orm';
import { union } from 'drizzle-orm/pg-core';
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
	standDownRestores,
	standDowns
} from '$lib/server/db/schema';

/** A stand-down still in force: no show manager has restored the prop since. */
export const notRestored = () =>
	sql`not exists (select 1 from ${standDownRestores} where ${standDownRestores.standDownId} = ${standDowns.id})`;

export interface ShowScene {
	id: string;
	name: string;
	roomId: string | null;
	/** Props whose sensors or outputs the scene uses. */
	propIds: string[];
	/** True when one of those props is stood down for the show: the scene holds its safe state. */
	stoodDown: boolean;
}

type Reader = Pick<Db, 'select' | 'selectDistinct'>;

/**
 * The ids of the scenes that run on one show, as a subquery: every scene of the venue marked to
 * run on show nights, less the ones left out of this show. Queries filter by it rather than by a
 * list of ids, so their parameters do not grow with the number of scenes.
 */
export function nightSceneIds(db: Reader, venueId: string, showId: string) {
	return db
		.select({ id: scenes.id })
		.from(scenes)
		.where(
			and(
				eq(scenes.venueId, venueId),
				eq(scenes.runsOnShowNights, true),
				notInArray(
					scenes.id,
					db
						.select({ id: showSceneExclusions.sceneId })
						.from(showSceneExclusions)
						.where(eq(showSceneExclusions.showId, showId))
				)
			)
		);
}

/** Outputs the night's scenes cue or drive from a sensor, as a subquery. */
export function nightOutputIds(db: Reader, venueId: string, showId: string) {
	return union(
		db
			.select({ id: sceneCues.outputId })
			.from(sceneCues)
			.where(inArray(sceneCues.sceneId, nightSceneIds(db, venueId, showId))),
		db
			.select({ id: sceneResponses.outputId })
			.from(sceneResponses)
			.where(inArray(sceneResponses.sceneId, nightSceneIds(db, venueId, showId)))
	);
}

/** Sensors the night's scenes respond to or start from, as a subquery. */
export function nightSensorIds(db: Reader, venueId: string, showId: string) {
	return union(
		db
			.select({ id: sceneResponses.sensorId })
			.from(sceneResponses)
			.where(inArray(sceneResponses.sceneId, nightSceneIds(db, venueId, showId))),
		db
			.select({ id: sql<string>`${scenes.triggerSensorId}`.as('id') })
			.from(scenes)
			.where(
				and(
					isNotNull(scenes.triggerSensorId),
					inArray(scenes.id, nightSceneIds(db, venueId, showId))
				)
			)
	);
}

/** Props whose sensors or outputs the night's scenes use, as a subquery. */
export function nightPropIds(db: Reader, venueId: string, showId: string) {
	return union(
		db
			.select({ id: outputs.propId })
			.from(outputs)
			.where(
				and(eq(outputs.venueId, venueId), inArray(outputs.id, nightOutputIds(db, venueId, showId)))
			),
		db
			.select({ id: sensors.propId })
			.from(sensors)
			.where(
				and(eq(sensors.venueId, venueId), inArray(sensors.id, nightSensorIds(db, venueId, showId)))
			)
	);
}

/**
 * The scenes that run on one show, each with the props it uses, found through its cues,
 * responses and trigger sensor: two rounds of statements however many scenes there are.
 */
export async function scenesForShow(
	db: Reader,
	venueId: string,
	showId: string
): Promise<ShowScene[]> {
	const ids = () => nightSceneIds(db, venueId, showId);
	const [rows, cueProps, responseSensorProps, responseOutputProps, triggerProps, down] =
		await Promise.all([
			db
				.select({ id: scenes.id, name: scenes.name, roomId: scenes.roomId })
				.from(scenes)
				.where(and(eq(scenes.venueId, venueId), inArray(scenes.id, ids())))
				.orderBy(scenes.name),
			db
				.selectDistinct({ sceneId: sceneCues.sceneId, propId: outputs.propId })
				.from(sceneCues)
				.innerJoin(outputs, eq(outputs.id, sceneCues.outputId))
				.where(inArray(sceneCues.sceneId, ids())),
			db
				.selectDistinct({ sceneId: sceneResponses.sceneId, propId: sensors.propId })
				.from(sceneResponses)
				.innerJoin(sensors, eq(sensors.id, sceneResponses.sensorId))
				.where(inArray(sceneResponses.sceneId, ids())),
			db
				.selectDistinct({ sceneId: sceneResponses.sceneId, propId: outputs.propId })
				.from(sceneResponses)
				.innerJoin(outputs, eq(outputs.id, sceneResponses.outputId))
				.where(inArray(sceneResponses.sceneId, ids())),
			db
				.select({ sceneId: scenes.id, propId: sensors.propId })
				.from(scenes)
				.innerJoin(sensors, eq(sensors.id, scenes.triggerSensorId))
				.where(inArray(scenes.id, ids())),
			db
				.select({ propId: standDowns.propId })
				.from(standDowns)
				.innerJoin(props, eq(props.id, standDowns.propId))
				.where(and(eq(standDowns.showId, showId), eq(standDowns.venueId, venueId), notRestored()))
		]);
	if (rows.length === 0) return [];

	const stood = new Set(down.map((d) => d.propId));
	const bySceneId = new Map<string, Set<string>>(rows.map((r) => [r.id, new Set()]));
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
	db: Reader,
	venueId: string,
	showId: string,
	signedAt: Date
): Promise<ChangeAfterSignOff[]> {
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
				inArray(sceneChanges.sceneId, nightSceneIds(db, venueId, showId)),
				gt(sceneChanges.at, signedAt)
			)
		)
		.orderBy(asc(sceneChanges.at));
}
