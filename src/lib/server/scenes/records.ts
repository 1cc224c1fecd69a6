import { and, asc, desc, eq, inArray } from 'drizzle-orm';
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
import { audit } from '$lib/server/audit';
import { isUniqueViolation } from '$lib/server/db/errors';
import {
	analyseScene,
	type AnalysisOutput,
	type SceneAnalysis,
	type Supply
} from '$lib/scenes/analysis';
import { hazardsOf } from '$lib/props/output-maths';
import { SAFE_STATE_LABELS } from '$lib/schemas/prop-words';
import type { SceneContent, SceneDetails } from '$lib/schemas/scene';
import type { Scene } from '$lib/scenes/types';
import { loadScene, toOutputModel, toSceneModel, type LoadedScene } from './model';

type SceneRow = typeof scenes.$inferSelect;
type CueRow = typeof sceneCues.$inferSelect;
type ResponseRow = typeof sceneResponses.$inferSelect;

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

const DETAIL_WORDS: Record<string, string> = {
	name: 'name',
	roomId: 'room',
	trigger: 'trigger',
	triggerSensorId: 'trigger sensor',
	loopMs: 'loop time',
	lengthMs: 'length',
	rearmMs: 're-arm time',
	runsOnShowNights: 'show nights',
	notes: 'notes'
};

type ContentRows = { cues: CueRow[]; responses: ResponseRow[] };
const cueKey = (c: { outputId: string; startMs: number; action: unknown }) =>
	JSON.stringify([c.outputId, c.startMs, c.action]);
const responseKey = (r: Record<string, unknown>) =>
	JSON.stringify(
		['sensorId', 'outputId', 'shape', 'threshold', 'points', 'minLevel', 'maxLevel'].map(
			(k) => r[k] ?? null
		)
	);

/** What changed between two versions of a scene, in words for the history and as detail. */
export function describeChange(
	before: { row: SceneRow } & ContentRows,
	after: { details: SceneDetails } & ContentRows,
	outputName: (id: string) => string
) {
	const fields = Object.keys(DETAIL_WORDS).filter(
		(k) =>
			JSON.stringify(before.row[k as keyof SceneRow] ?? null) !==
			JSON.stringify(after.details[k as keyof SceneDetails] ?? null)
	);
	const tally = <T extends { id: string }>(old: T[], next: T[], key: (x: T) => string) => {
		const oldIds = new Map(old.map((x) => [x.id, x]));
		const nextIds = new Set(next.map((x) => x.id));
		return {
			added: next.filter((x) => !oldIds.has(x.id)),
			removed: old.filter((x) => !nextIds.has(x.id)),
			changed: next.filter((x) => oldIds.has(x.id) && key(oldIds.get(x.id)!) !== key(x))
		};
	};
	const cues = tally(before.cues, after.cues, cueKey);
	const responses = tally(
		before.responses,
		after.responses,
		responseKey as (x: ResponseRow) => string
	);
	const parts: string[] = [];
	if (fields.length) parts.push(`changed the ${fields.map((f) => DETAIL_WORDS[f]).join(', ')}`);
	const lanes = (list: { outputId: string }[]) =>
		[...new Set(list.map((x) => outputName(x.outputId)))].join(', ');
	const n = (count: number, word: string) => `${count} ${word}${count === 1 ? '' : 's'}`;
	if (cues.added.length) parts.push(`added ${n(cues.added.length, 'cue')} on ${lanes(cues.added)}`);
	if (cues.changed.length)
		parts.push(`moved or edited ${n(cues.changed.length, 'cue')} on ${lanes(cues.changed)}`);
	if (cues.removed.length)
		parts.push(`removed ${n(cues.removed.length, 'cue')} from ${lanes(cues.removed)}`);
	if (responses.added.length)
		parts.push(`added ${n(responses.added.length, 'response')} on ${lanes(responses.added)}`);
	if (responses.changed.length) parts.push(`changed ${n(responses.changed.length, 'response')}`);
	if (responses.removed.length) parts.push(`removed ${n(responses.removed.length, 'response')}`);
	const summary = parts.length ? parts.join('; ') : '';
	return {
		summary: summary ? summary.charAt(0).toUpperCase() + summary.slice(1) + '.' : '',
		detail: {
			fields,
			cues: {
				added: cues.added.length,
				changed: cues.changed.length,
				removed: cues.removed.length
			},
			responses: {
				added: responses.added.length,
				changed: responses.changed.length,
				removed: responses.removed.length
			}
		}
	};
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
		{ row: loaded.row, cues: loaded.cues, responses: loaded.responses },
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
	const { row } = loaded;
	return createScene(
		db,
		venueId,
		personId,
		{
			name,
			roomId: row.roomId,
			trigger: row.trigger,
			triggerSensorId: row.triggerSensorId,
			loopMs: row.loopMs,
			lengthMs: row.lengthMs,
			rearmMs: row.rearmMs,
			runsOnShowNights: row.runsOnShowNights,
			notes: row.notes
		},
		{
			cues: loaded.cues.map(({ outputId, startMs, action }) => ({ outputId, startMs, action })),
			responses: loaded.responses.map(
				({ sensorId, outputId, shape, threshold, points, minLevel, maxLevel }) => ({
					sensorId,
					outputId,
					shape,
					threshold,
					points,
					minLevel,
					maxLevel
				})
			)
		},
		`Duplicated from '${row.name}'.`
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

/** A scene as the JSON API gives it: details in milliseconds, cues and responses. */
export function sceneJson(loaded: LoadedScene) {
	const { row, cues, responses } = loaded;
	return {
		id: row.id,
		name: row.name,
		roomId: row.roomId,
		trigger: row.trigger,
		triggerSensorId: row.triggerSensorId,
		loopMs: row.loopMs,
		lengthMs: row.lengthMs,
		rearmMs: row.rearmMs,
		runsOnShowNights: row.runsOnShowNights,
		notes: row.notes,
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
	const rows = await db
		.selectDistinct({ id: scenes.id, name: scenes.name })
		.from(scenes)
		.innerJoin(sceneCues, eq(sceneCues.sceneId, scenes.id))
		.where(and(eq(scenes.venueId, venueId), inArray(sceneCues.outputId, outputIds)));
	const viaResponses = await db
		.selectDistinct({ id: scenes.id, name: scenes.name })
		.from(scenes)
		.innerJoin(sceneResponses, eq(sceneResponses.sceneId, scenes.id))
		.where(and(eq(scenes.venueId, venueId), inArray(sceneResponses.outputId, outputIds)));
	const all = new Map([...rows, ...viaResponses].map((r) => [r.id, r]));
	return [...all.values()].sort((a, b) => a.name.localeCompare(b.name));
}
