import { and, eq, inArray } from 'drizzle-orm';
import { groupBy } from '$lib/util/group';
import type { Db } from '$lib/server/db/client';
import {
	outputs,
	props,
	sceneCues,
	sceneResponses,
	scenes,
	sensors,
	standDowns
} from '$lib/server/db/schema';
import { toOutputModel, toSceneModel, type LoadedScene } from './model';
import { nightPropIds, nightSceneIds, notRestored, type ShowScene } from './for-show';

type Reader = Pick<Db, 'select' | 'selectDistinct'>;

export type NightScene = ShowScene & LoadedScene;

export interface Night {
	scenes: NightScene[];
	/** Every prop the night's scenes use, with all of their sensors and outputs. */
	props: (typeof props.$inferSelect)[];
	sensors: (typeof sensors.$inferSelect)[];
	outputs: (typeof outputs.$inferSelect)[];
	standDowns: { propId: string; reason: string }[];
}

/**
 * Everything about the scenes that run on one show, in one round of seven statements however many
 * scenes and props there are: the scene ids, and the props they use, are subqueries rather than
 * parameter lists, so no statement carries more than a few parameters.
 */
export async function loadNight(db: Reader, venueId: string, showId: string): Promise<Night> {
	const sceneIds = () => nightSceneIds(db, venueId, showId);
	const propIds = () => nightPropIds(db, venueId, showId);

	const [sceneRows, cueRows, responseRows, downRows, propRows, sensorRows, outputRows] =
		await Promise.all([
			db
				.select()
				.from(scenes)
				.where(and(eq(scenes.venueId, venueId), inArray(scenes.id, sceneIds())))
				.orderBy(scenes.name),
			db
				.select()
				.from(sceneCues)
				.where(and(eq(sceneCues.venueId, venueId), inArray(sceneCues.sceneId, sceneIds())))
				.orderBy(sceneCues.startMs),
			db
				.select()
				.from(sceneResponses)
				.where(
					and(eq(sceneResponses.venueId, venueId), inArray(sceneResponses.sceneId, sceneIds()))
				),
			db
				.select({ propId: standDowns.propId, reason: standDowns.reason })
				.from(standDowns)
				.where(and(eq(standDowns.showId, showId), eq(standDowns.venueId, venueId), notRestored())),
			db
				.select()
				.from(props)
				.where(and(eq(props.venueId, venueId), inArray(props.id, propIds()))),
			db
				.select()
				.from(sensors)
				.where(and(eq(sensors.venueId, venueId), inArray(sensors.propId, propIds())))
				.orderBy(sensors.name),
			db
				.select()
				.from(outputs)
				.where(and(eq(outputs.venueId, venueId), inArray(outputs.propId, propIds())))
				.orderBy(outputs.name)
		]);

	const outputById = new Map(outputRows.map((o) => [o.id, o]));
	const sensorById = new Map(sensorRows.map((s) => [s.id, s]));
	const cuesOf = groupBy(cueRows, (c) => c.sceneId);
	const responsesOf = groupBy(responseRows, (r) => r.sceneId);
	const stood = new Set(downRows.map((d) => d.propId));

	const night: NightScene[] = sceneRows.map((row) => {
		const cues = cuesOf.get(row.id) ?? [];
		const responses = responsesOf.get(row.id) ?? [];
		const used = [...new Set([...cues, ...responses].map((x) => x.outputId))]
			.map((id) => outputById.get(id))
			.filter((o) => o !== undefined);
		const propSet = new Set(used.map((o) => o.propId));
		for (const r of responses) {
			const s = sensorById.get(r.sensorId);
			if (s) propSet.add(s.propId);
		}
		const trigger = row.triggerSensorId ? sensorById.get(row.triggerSensorId) : undefined;
		if (trigger) propSet.add(trigger.propId);
		const propIdList = [...propSet];
		return {
			id: row.id,
			name: row.name,
			roomId: row.roomId,
			propIds: propIdList,
			stoodDown: propIdList.some((id) => stood.has(id)),
			row,
			cues,
			responses,
			outputRows: used,
			scene: toSceneModel(row, cues, responses),
			outputs: used.map(toOutputModel)
		};
	});
	return {
		scenes: night,
		props: propRows,
		sensors: sensorRows,
		outputs: outputRows,
		standDowns: downRows
	};
}
