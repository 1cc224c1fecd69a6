/** Writing scenes: creating, saving, duplicating and removing, each with its history and audit lines. */
import { and, eq } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { sceneChanges, sceneCues, sceneResponses, scenes } from '$lib/server/db/schema';
import { audit } from '$lib/server/audit';
import { isUniqueViolation } from '$lib/server/db/errors';
import { describeChange } from '$lib/scenes/changes';
import type { SceneContent, SceneDetails } from '$lib/schemas/scene';
import type { LoadedScene } from './model';
import { sceneDetailsOf, sceneJson, type SceneContext } from './reads';

type SceneRow = typeof scenes.$inferSelect;

/** Checks that every room, sensor and output named belongs to this venue; errors by field path. */
export function refErrors(
	context: SceneContext,
	details: Pick<SceneDetails, 'roomId' | 'triggerSensorId'>,
	content?: Partial<SceneContent>
) {
	const errors: Record<string, string[]> = {};
	const outputIds = new Set(context.outputs.map((o) => o.id));
	const sensorIds = new Set(context.sensors.map((s) => s.id));
	if (details.roomId && !context.rooms.some((r) => r.id === details.roomId))
		errors.roomId = ['Choose a room from the list.'];
	if (details.triggerSensorId && !sensorIds.has(details.triggerSensorId))
		errors.triggerSensorId = ['Choose a sensor from the list.'];
	content?.cues?.forEach((c, i) => {
		if (!outputIds.has(c.outputId))
			errors[`cues.${i}.outputId`] = ['Choose an output from the list.'];
	});
	content?.responses?.forEach((r, i) => {
		if (!outputIds.has(r.outputId))
			errors[`responses.${i}.outputId`] = ['Choose an output from the list.'];
		if (!sensorIds.has(r.sensorId))
			errors[`responses.${i}.sensorId`] = ['Choose a sensor from the list.'];
	});
	return errors;
}

const isUuid = (s: string | undefined) =>
	!!s && /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);

/** New rows for a scene's cues and responses; ids of rows the scene already had are kept. */
function contentRows(
	venueId: string,
	sceneId: string,
	content: SceneContent,
	keep: { cues: Set<string>; responses: Set<string> }
) {
	const id = (given: string | undefined, known: Set<string>) =>
		isUuid(given) && known.has(given!) ? given! : crypto.randomUUID();
	return {
		cues: content.cues.map((c) => ({
			id: id(c.id, keep.cues),
			venueId,
			sceneId,
			outputId: c.outputId,
			startMs: c.startMs,
			action: c.action,
			createdAt: new Date()
		})),
		responses: content.responses.map((r) => ({
			id: id(r.id, keep.responses),
			venueId,
			sceneId,
			sensorId: r.sensorId,
			outputId: r.outputId,
			shape: r.shape,
			threshold: r.threshold,
			points: r.points,
			minLevel: r.minLevel,
			maxLevel: r.maxLevel,
			createdAt: new Date()
		}))
	};
}

export class NameTaken extends Error {}

/** The name check and the write are separate steps: a save racing another for a name loses here. */
async function sameNameRace<T>(write: () => Promise<T>): Promise<T> {
	try {
		return await write();
	} catch (e) {
		if (isUniqueViolation(e, 'scenes_venue_name')) throw new NameTaken();
		throw e;
	}
}

async function nameTaken(db: Db, venueId: string, name: string, except?: string) {
	const rows = await db
		.select({ id: scenes.id })
		.from(scenes)
		.where(and(eq(scenes.venueId, venueId), eq(scenes.name, name)));
	return rows.some((r) => r.id !== except);
}

/** Creates a scene (and its cues and responses) with a first line in its history. */
export async function createScene(
	db: Db,
	venueId: string,
	personId: string,
	details: SceneDetails,
	content: SceneContent = { cues: [], responses: [] },
	summary = 'Created the scene.'
) {
	if (await nameTaken(db, venueId, details.name)) throw new NameTaken();
	return sameNameRace(() =>
		db.transaction(async (tx) => {
			const [row] = await tx
				.insert(scenes)
				.values({ ...details, venueId })
				.returning();
			const rows = contentRows(venueId, row.id, content, { cues: new Set(), responses: new Set() });
			if (rows.cues.length) await tx.insert(sceneCues).values(rows.cues);
			if (rows.responses.length) await tx.insert(sceneResponses).values(rows.responses);
			await tx.insert(sceneChanges).values({
				venueId,
				sceneId: row.id,
				personId,
				summary,
				detail: { created: true, cues: rows.cues.length, responses: rows.responses.length }
			});
			await audit(tx, { venueId, personId, action: 'scene.created', detail: { name: row.name } });
			return row;
		})
	);
}

/**
 * Saves a scene's details and, when given, replaces its cues and responses. Writes what changed to
 * the history; a save that changes nothing writes nothing.
 */
export async function saveScene(
	db: Db,
	venueId: string,
	personId: string,
	loaded: LoadedScene,
	details: SceneDetails,
	content: SceneContent | undefined,
	outputName: (id: string) => string
) {
	if (await nameTaken(db, venueId, details.name, loaded.row.id)) throw new NameTaken();
	const next = content ?? {
		cues: loaded.cues.map((c) => ({ ...c })),
		responses: loaded.responses.map((r) => ({ ...r }))
	};
	const rows = contentRows(venueId, loaded.row.id, next as SceneContent, {
		cues: new Set(loaded.cues.map((c) => c.id)),
		responses: new Set(loaded.responses.map((r) => r.id))
	});
	const change = describeChange(
		{ details: loaded.row, cues: loaded.cues, responses: loaded.responses },
		{ details, cues: rows.cues, responses: rows.responses },
		outputName
	);
	if (!change.summary) return { changed: false };
	await sameNameRace(() =>
		db.transaction(async (tx) => {
			await tx
				.update(scenes)
				.set({ ...details, updatedAt: new Date() })
				.where(and(eq(scenes.id, loaded.row.id), eq(scenes.venueId, venueId)));
			if (content) {
				await tx.delete(sceneCues).where(eq(sceneCues.sceneId, loaded.row.id));
				await tx.delete(sceneResponses).where(eq(sceneResponses.sceneId, loaded.row.id));
				if (rows.cues.length) await tx.insert(sceneCues).values(rows.cues);
				if (rows.responses.length) await tx.insert(sceneResponses).values(rows.responses);
			}
			await tx.insert(sceneChanges).values({
				venueId,
				sceneId: loaded.row.id,
				personId,
				summary: change.summary,
				detail: change.detail
			});
			await audit(tx, {
				venueId,
				personId,
				action: 'scene.changed',
				detail: { name: details.name, summary: change.summary }
			});
		})
	);
	return { changed: true, summary: change.summary };
}

/** Copies a scene with its cues and responses under a free name ("… (copy)", "… (copy 2)"). */
export async function duplicateScene(
	db: Db,
	venueId: string,
	personId: string,
	loaded: LoadedScene
) {
	const taken = new Set(
		(await db.select({ name: scenes.name }).from(scenes).where(eq(scenes.venueId, venueId))).map(
			(r) => r.name
		)
	);
	let name = `${loaded.row.name} (copy)`;
	for (let i = 2; taken.has(name); i++) name = `${loaded.row.name} (copy ${i})`;
	// The same details and content under the new name; createScene gives the copy's cues and
	// responses ids of their own.
	const { cues, responses } = sceneJson(loaded);
	return createScene(
		db,
		venueId,
		personId,
		{ ...sceneDetailsOf(loaded.row), name },
		{ cues, responses },
		`Duplicated from '${loaded.row.name}'.`
	);
}

/** Remove a scene; false when it was already gone (removed a moment ago by someone else). */
export async function deleteScene(db: Db, venueId: string, personId: string, row: SceneRow) {
	const done = await db
		.delete(scenes)
		.where(and(eq(scenes.id, row.id), eq(scenes.venueId, venueId)))
		.returning({ id: scenes.id });
	if (!done.length) return false;
	await audit(db, { venueId, personId, action: 'scene.removed', detail: { name: row.name } });
	return true;
}
