/**
 * The scene editor's state: the cues and responses being edited, the lanes, the selected cue, the
 * preview's playhead and depths, and the number fields that hold typing they will not keep. The
 * page and its panels share one SceneEditor; the scene maths stay in `$lib/scenes`.
 */
import { analyseScene } from '$lib/scenes/analysis';
import { previewAt } from '$lib/scenes/preview';
import { timelineEndMs } from '$lib/scenes/timeline';
import type { Cue, CueAction, Response, Scene } from '$lib/scenes/types';
import type { PageData } from './$types';

export type EditResponse = Response & {
	shape: NonNullable<Response['shape']>;
	minLevel: number;
	maxLevel: number;
};

/** A time in seconds, to two places at most: '1.25 s'. */
export const seconds = (ms: number) => `${Number((ms / 1000).toFixed(2))} s`;
/** A fraction as a percentage to one place: '42.0 %'. */
export const pct = (x: number) => `${(x * 100).toFixed(1)} %`;

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));
/** Read-only lookups for derived values: built anew each time, never changed in place. */
const byIdOf = <T extends { id: string }>(list: T[]): ReadonlyMap<string, T> =>
	new Map(list.map((x) => [x.id, x]));
const setOf = <T>(list: T[]): ReadonlySet<T> => new Set(list);
const unique = <T>(list: T[]): T[] => [...setOf(list)];

/** Outputs or sensors of the scene's room first, then by prop name. */
function roomFirst<T extends { roomId: string | null; propName: string }>(
	list: T[],
	roomId: string | null
) {
	return [...list].sort(
		(a, b) =>
			Number(b.roomId === roomId) - Number(a.roomId === roomId) ||
			a.propName.localeCompare(b.propName)
	);
}

export class SceneEditor {
	readonly #data: () => PageData;
	cues = $state<Cue[]>([]);
	responses = $state<EditResponse[]>([]);
	lengthMs = $state(0);
	rearmMs = $state(0);
	extraLanes = $state<string[]>([]);
	selectedId = $state<string | null>(null);
	depths = $state<Record<string, number>>({});
	playheadMs = $state(0);
	playing = $state(false);
	saving = $state(false);
	newLane = $state('');
	/** Number fields that hold typing they will not keep (out of range, unreadable): saving waits. */
	problems = $state<Record<string, string>>({});
	refusedSave = $state(false);
	#nextId = 0;
	#frame = 0;
	#last = 0;

	constructor(data: () => PageData) {
		this.#data = data;
		const fresh = this.#fromData();
		this.cues = fresh.cues;
		this.responses = fresh.responses;
		this.lengthMs = data().scene.lengthMs;
		this.rearmMs = data().scene.rearmMs;
	}

	get data() {
		return this.#data();
	}

	#fromData() {
		return {
			cues: clone(this.data.scene.cues) as Cue[],
			responses: clone(this.data.scene.responses) as EditResponse[]
		};
	}

	byId = $derived(byIdOf(this.data.outputs));
	sensorById = $derived(byIdOf(this.data.sensors));
	laneIds = $derived(
		unique([
			...this.cues.map((c) => c.outputId),
			...this.responses.map((r) => r.outputId),
			...this.extraLanes
		])
	);
	lanes = $derived(this.laneIds.map((id) => this.byId.get(id)).filter((o) => o !== undefined));
	model: Scene = $derived({
		lengthMs: this.lengthMs,
		rearmMs: this.rearmMs,
		cues: this.cues,
		responses: this.responses
	});
	endMs = $derived(timelineEndMs(this.model));
	analysis = $derived(
		analyseScene(this.model, this.lanes, {
			supplies: this.data.supplies,
			dispatchIntervalS: this.data.dispatchIntervalS,
			groupSize: this.data.groupSize
		})
	);
	flagged = $derived(
		setOf(this.analysis.findings.filter((f) => f.severity !== 'info').flatMap((f) => f.cueIds))
	);
	preview = $derived(previewAt(this.model, this.lanes, this.playheadMs, this.depths));
	hazards = $derived(unique(this.lanes.flatMap((o) => o.hazards)));
	previewSensors = $derived(
		unique(this.responses.map((r) => r.sensorId))
			.map((id) => this.sensorById.get(id))
			.filter((s) => s !== undefined)
	);
	selected = $derived(this.cues.find((c) => c.id === this.selectedId) ?? null);
	content = $derived(JSON.stringify({ cues: this.cues, responses: this.responses }));
	dirty = $derived(
		this.content !== JSON.stringify(this.#fromData()) ||
			this.lengthMs !== this.data.scene.lengthMs ||
			this.rearmMs !== this.data.scene.rearmMs
	);
	roomOutputs = $derived(roomFirst(this.data.outputs, this.data.scene.roomId));
	roomSensors = $derived(roomFirst(this.data.sensors, this.data.scene.roomId));
	problemList = $derived(Object.values(this.problems));

	/** After a save: the cues and responses as stored, no extra lanes, nothing selected. */
	reset() {
		const fresh = this.#fromData();
		this.cues = fresh.cues;
		this.responses = fresh.responses;
		this.extraLanes = [];
		this.selectedId = null;
	}

	/** The length and re-arm typed into the details form, as the timeline's end and the cycle. */
	readDetails(form: HTMLFormElement) {
		const f = form.elements;
		const num = (name: string) => Number((f.namedItem(name) as HTMLInputElement | null)?.value);
		const length = num('lengthS');
		const rearm = num('rearmS');
		if (Number.isFinite(length) && length > 0) this.lengthMs = Math.round(length * 1000);
		if (Number.isFinite(rearm) && rearm >= 0) this.rearmMs = Math.round(rearm * 1000);
	}

	problemAt = (id: string, message: string | null) => {
		if (message) this.problems[id] = message;
		else delete this.problems[id];
	};

	// Cues
	addLane() {
		if (this.newLane && !this.laneIds.includes(this.newLane)) this.extraLanes.push(this.newLane);
		this.newLane = '';
	}

	addCue() {
		const outputId = this.selected?.outputId ?? this.lanes[0]?.id;
		if (!outputId) return;
		const cue: Cue = {
			id: `new-${++this.#nextId}`,
			outputId,
			startMs: Math.round(this.playheadMs / 100) * 100,
			action: { type: 'set', level: 1 }
		};
		this.cues.push(cue);
		this.selectedId = cue.id;
	}

	removeCue = (id: string) => {
		const cue = this.cues.find((c) => c.id === id);
		if (!cue) return;
		const name = this.byId.get(cue.outputId)?.name ?? 'this lane';
		if (!confirm(`Remove the ${cue.action.type} at ${seconds(cue.startMs)} on ${name}?`)) return;
		this.cues = this.cues.filter((c) => c.id !== id);
		if (this.selectedId === id) this.selectedId = null;
	};

	/** A cue's action of another type, keeping its level and length where the new type has them. */
	setType(cue: Cue, type: CueAction['type']) {
		const a = cue.action;
		const level = 'level' in a ? a.level : 1;
		const durationMs = 'durationMs' in a && a.durationMs > 0 ? a.durationMs : 1000;
		cue.action =
			type === 'set'
				? { type, level }
				: type === 'fade'
					? { type, level, durationMs }
					: type === 'pulse'
						? { type, durationMs }
						: { type, level, durationMs, rateHz: 3 };
	}

	// Responses
	addResponse() {
		const sensor = this.roomSensors[0];
		const output = this.roomOutputs.find((o) => o.kind === 'led') ?? this.roomOutputs[0];
		if (!sensor || !output) return;
		this.responses.push({
			id: `new-${++this.#nextId}`,
			sensorId: sensor.id,
			outputId: output.id,
			shape: 'rise',
			threshold: null,
			points: null,
			minLevel: 0,
			maxLevel: 1
		});
	}

	removeResponse(id: string) {
		if (confirm('Remove this response?'))
			this.responses = this.responses.filter((x) => x.id !== id);
	}

	// Preview playback
	#tick = (now: number) => {
		if (!this.playing) return;
		this.playheadMs = Math.min(this.endMs, this.playheadMs + (now - this.#last));
		this.#last = now;
		if (this.playheadMs >= this.endMs) this.playing = false;
		else this.#frame = requestAnimationFrame(this.#tick);
	};

	togglePlay() {
		if (this.playing) {
			this.playing = false;
			cancelAnimationFrame(this.#frame);
			return;
		}
		if (this.playheadMs >= this.endMs) this.playheadMs = 0;
		this.playing = true;
		this.#last = performance.now();
		this.#frame = requestAnimationFrame(this.#tick);
	}

	/** Moving the playhead by hand stops the playback. */
	seek(ms: number) {
		this.playing = false;
		this.playheadMs = ms;
	}

	destroy() {
		if (this.#frame) cancelAnimationFrame(this.#frame);
	}
}

/** A response's drawn points as the textarea shows them: 'depth, level' a line. */
export const pointsText = (points: [number, number][] | null | undefined) =>
	(points ?? []).map(([d, l]) => `${d}, ${l}`).join('\n');

/** The points typed into the textarea; a line that is not two numbers is left out. */
export function readPoints(r: EditResponse, text: string) {
	r.points = text
		.split(/\n|;/)
		.map((line) =>
			line
				.split(/[,\s]+/)
				.filter(Boolean)
				.map(Number)
		)
		.filter((p) => p.length === 2 && p.every(Number.isFinite)) as [number, number][];
}
