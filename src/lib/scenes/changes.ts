/**
 * What changed between two versions of a scene, in words for its history and as counts. Pure: the
 * server writes the result to the scene's change history.
 */

/** The scene details a change can name, and the word for each. */
const DETAIL_WORDS = {
	name: 'name',
	roomId: 'room',
	trigger: 'trigger',
	triggerSensorId: 'trigger sensor',
	loopMs: 'loop time',
	lengthMs: 'length',
	rearmMs: 're-arm time',
	runsOnShowNights: 'show nights',
	notes: 'notes'
} as const;
export type SceneDetailField = keyof typeof DETAIL_WORDS;

export interface CueVersion {
	id: string;
	outputId: string;
	startMs: number;
	action: unknown;
}

export interface ResponseVersion {
	id: string;
	sensorId: string;
	outputId: string;
	shape?: unknown;
	threshold?: unknown;
	points?: unknown;
	minLevel?: unknown;
	maxLevel?: unknown;
}

/** One version of a scene: its details, cues and responses. */
export interface SceneVersion {
	details: Record<SceneDetailField, unknown>;
	cues: CueVersion[];
	responses: ResponseVersion[];
}

export interface SceneChange {
	/** 'Changed the name; added 2 cues on Lantern.', or '' when nothing changed. */
	summary: string;
	detail: {
		fields: SceneDetailField[];
		cues: Tally;
		responses: Tally;
	};
}
type Tally = { added: number; changed: number; removed: number };

const cueKey = (c: CueVersion) => JSON.stringify([c.outputId, c.startMs, c.action]);
const RESPONSE_FIELDS = [
	'sensorId',
	'outputId',
	'shape',
	'threshold',
	'points',
	'minLevel',
	'maxLevel'
] as const;
const responseKey = (r: ResponseVersion) =>
	JSON.stringify(RESPONSE_FIELDS.map((k) => r[k] ?? null));

/** Rows added, removed, and kept under the same id with other content. */
function compare<T extends { id: string }>(old: T[], next: T[], key: (x: T) => string) {
	const oldById = new Map(old.map((x) => [x.id, x]));
	const nextIds = new Set(next.map((x) => x.id));
	return {
		added: next.filter((x) => !oldById.has(x.id)),
		removed: old.filter((x) => !nextIds.has(x.id)),
		changed: next.filter((x) => oldById.has(x.id) && key(oldById.get(x.id)!) !== key(x))
	};
}

const plural = (count: number, word: string) => `${count} ${word}${count === 1 ? '' : 's'}`;
const counts = (c: { added: unknown[]; changed: unknown[]; removed: unknown[] }): Tally => ({
	added: c.added.length,
	changed: c.changed.length,
	removed: c.removed.length
});

/** What changed from one version of a scene to the next; outputName names an output by its id. */
export function describeChange(
	before: SceneVersion,
	after: SceneVersion,
	outputName: (id: string) => string
): SceneChange {
	const fields = (Object.keys(DETAIL_WORDS) as SceneDetailField[]).filter(
		(k) => JSON.stringify(before.details[k] ?? null) !== JSON.stringify(after.details[k] ?? null)
	);
	const cues = compare(before.cues, after.cues, cueKey);
	const responses = compare(before.responses, after.responses, responseKey);
	const lanes = (list: { outputId: string }[]) =>
		[...new Set(list.map((x) => outputName(x.outputId)))].join(', ');
	const parts: string[] = [];
	if (fields.length) parts.push(`changed the ${fields.map((f) => DETAIL_WORDS[f]).join(', ')}`);
	if (cues.added.length)
		parts.push(`added ${plural(cues.added.length, 'cue')} on ${lanes(cues.added)}`);
	if (cues.changed.length)
		parts.push(`moved or edited ${plural(cues.changed.length, 'cue')} on ${lanes(cues.changed)}`);
	if (cues.removed.length)
		parts.push(`removed ${plural(cues.removed.length, 'cue')} from ${lanes(cues.removed)}`);
	if (responses.added.length)
		parts.push(`added ${plural(responses.added.length, 'response')} on ${lanes(responses.added)}`);
	if (responses.changed.length)
		parts.push(`changed ${plural(responses.changed.length, 'response')}`);
	if (responses.removed.length)
		parts.push(`removed ${plural(responses.removed.length, 'response')}`);
	const summary = parts.join('; ');
	return {
		summary: summary ? summary.charAt(0).toUpperCase() + summary.slice(1) + '.' : '',
		detail: { fields, cues: counts(cues), responses: counts(responses) }
	};
}
