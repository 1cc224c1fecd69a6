import {
	cueEndMs,
	cueProblem,
	cuesFor,
	timelineEndMs,
	timelinePoints,
	type TimelinePoint
} from './timeline';
import { responseJumps, responseMaxLevel } from './response';
import type { Cue, Finding, FindingCode, Output, Scene, Severity } from './types';

/** Plan continuous load at no more than 80 % of a supply's rating (common practice). */
export const SUPPLY_DERATING = 0.8;
/** WCAG 2.x general flash: opposing changes of at least 10 % of maximum relative luminance... */
export const FLASH_CHANGE = 0.1;
/** ...where the darker state is below 0.80. */
export const FLASH_DARKER_BELOW = 0.8;
/** WCAG 2.3.1: no more than three flashes in any one-second period. */
export const MAX_FLASHES_PER_SECOND = 3;

const TOLERANCE = 1e-9;

export interface SceneCheckOptions {
	/** Rated current of the supply feeding these outputs, in amps. */
	supplyAmps?: number;
	/** Seconds between groups sent into the room. */
	dispatchIntervalS?: number;
	/** Guests per group. */
	groupSize?: number;
	/** Relative luminance 0..1 of an LED output at a level (after its brightness curve); the level itself if not given. */
	luminance?: (output: Output, level: number) => number;
}

export interface CueOverlap {
	outputId: string;
	first: Cue;
	second: Cue;
	fromMs: number;
	toMs: number;
}

export interface FlashWindow {
	/** Transitions in the busiest one-second window divided by two (a flash is a pair). */
	flashes: number;
	/** Start of that window. */
	fromMs: number;
}

export interface PeakCurrent {
	amps: number;
	atMs: number;
	/** Outputs drawing current at the peak. */
	outputIds: string[];
}

export interface OnPeriod {
	startMs: number;
	endMs: number;
	/** Still on when the timeline ends. */
	onAtEnd: boolean;
}

/** Length plus re-arm: the soonest the scene can run again. */
export function cycleMs(scene: Scene): number {
	return scene.lengthMs + scene.rearmMs;
}

/** Guests per hour: group size x 3600 / interval, where a scene cycle longer than the dispatch interval sets the pace. */
export function throughputPerHour(
	groupSize: number,
	dispatchIntervalS: number,
	cycleS = 0
): number {
	const interval = Math.max(dispatchIntervalS, cycleS);
	if (!(groupSize > 0) || !(interval > 0)) {
		throw new RangeError('Group size and dispatch interval must be more than 0.');
	}
	return (groupSize * 3600) / interval;
}

/** Pairs of cues on one output whose times overlap (a cue at the same moment as another counts). */
export function findCueOverlaps(scene: Scene): CueOverlap[] {
	const overlaps: CueOverlap[] = [];
	const outputIds = [...new Set(scene.cues.map((cue) => cue.outputId))];
	for (const outputId of outputIds) {
		const cues = cuesFor(scene, outputId);
		for (let i = 0; i < cues.length; i++) {
			const a = cues[i];
			for (let j = i + 1; j < cues.length; j++) {
				const b = cues[j];
				if (b.startMs !== a.startMs && b.startMs >= cueEndMs(a)) break;
				const toMs = Math.min(cueEndMs(a), cueEndMs(b));
				overlaps.push({ outputId, first: a, second: b, fromMs: b.startMs, toMs });
			}
		}
	}
	return overlaps;
}

/** Turning points after ignoring any swing smaller than a flash-sized change. */
function turningPoints(points: TimelinePoint[]): TimelinePoint[] {
	if (points.length === 0) return [];
	const pivots: TimelinePoint[] = [];
	let direction = 0;
	let low = points[0];
	let high = points[0];
	let extreme = points[0];
	for (const p of points) {
		if (direction === 0) {
			if (p.level > high.level) high = p;
			if (p.level < low.level) low = p;
			if (high.level - low.level >= FLASH_CHANGE - TOLERANCE) {
				pivots.push(high === p ? low : high);
				direction = high === p ? 1 : -1;
				extreme = p;
			}
		} else if (direction * (p.level - extreme.level) > 0) {
			extreme = p;
		} else if (Math.abs(p.level - extreme.level) >= FLASH_CHANGE - TOLERANCE) {
			pivots.push(extreme);
			direction = -direction;
			extreme = p;
		}
	}
	if (direction !== 0) pivots.push(extreme);
	return pivots;
}

/**
 * Times at which each flash transition completes: a change of relative luminance of at least 10 %
 * of maximum, opposite in direction to the one before, whose darker state is below 0.80.
 */
export function flashTransitions(luminance: TimelinePoint[]): number[] {
	const pivots = turningPoints(luminance);
	const times: number[] = [];
	for (let i = 1; i < pivots.length; i++) {
		const [a, b] = [pivots[i - 1], pivots[i]];
		if (Math.min(a.level, b.level) < FLASH_DARKER_BELOW) times.push(b.tMs);
	}
	return times;
}

/** The busiest one-second window of a luminance timeline, counted in flashes. */
export function maxFlashesPerSecond(luminance: TimelinePoint[]): FlashWindow {
	return busiestSecond(flashTransitions(luminance));
}

/**
 * The busiest one-second window of several lights seen together. Their transitions are pooled,
 * and transitions at the same moment count once: lights that change together make one flash.
 */
export function maxFlashesPerSecondTogether(lights: TimelinePoint[][]): FlashWindow {
	const times = [...new Set(lights.flatMap(flashTransitions))].sort((a, b) => a - b);
	return busiestSecond(times);
}

function busiestSecond(times: number[]): FlashWindow {
	let best = { count: 0, fromMs: 0 };
	let j = 0;
	for (let i = 0; i < times.length; i++) {
		while (j < times.length && times[j] - times[i] < 1000 - 1e-6) j++;
		if (j - i > best.count) best = { count: j - i, fromMs: times[i] };
	}
	return { flashes: best.count / 2, fromMs: best.fromMs };
}

/** An output's level just before and at a time, from its points. */
function sidesAt(points: TimelinePoint[], t: number): [number, number] {
	let lo = 0;
	let hi = points.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (points[mid].tMs < t) lo = mid + 1;
		else hi = mid;
	}
	if (lo === points.length) {
		const last = points.at(-1)?.level ?? 0;
		return [last, last];
	}
	if (points[lo].tMs === t) {
		let end = lo;
		while (end + 1 < points.length && points[end + 1].tMs === t) end++;
		return [points[lo].level, points[end].level];
	}
	if (lo === 0) return [0, 0];
	const [a, b] = [points[lo - 1], points[lo]];
	const level = a.level + ((b.level - a.level) * (t - a.tMs)) / (b.tMs - a.tMs);
	return [level, level];
}

function usedOutputs(scene: Scene, outputs: Output[]): Output[] {
	const used = new Set([
		...scene.cues.map((cue) => cue.outputId),
		...(scene.responses ?? []).map((r) => r.outputId)
	]);
	return outputs.filter((output) => used.has(output.id));
}

/** An output's timeline with any response held at its highest level, since a guest can drive it there at any moment. */
function worstCasePoints(scene: Scene, output: Output): TimelinePoint[] {
	const points = timelinePoints(scene, output.id, { kind: output.kind });
	const responses = (scene.responses ?? []).filter((r) => r.outputId === output.id);
	if (responses.length === 0) return points;
	let floor = Math.max(...responses.map(responseMaxLevel));
	floor = Math.min(1, Math.max(0, floor));
	if (output.kind === 'relay') floor = floor > 0 ? 1 : 0;
	return points.map((p) => ({ tMs: p.tMs, level: Math.max(p.level, floor) }));
}

/**
 * Highest total current over the timeline: LED strings draw their full current times their level,
 * relays their full current while on. Responses count at their highest level.
 */
export function peakCurrent(scene: Scene, outputs: Output[]): PeakCurrent {
	const lanes = usedOutputs(scene, outputs).map((output) => ({
		output,
		points: worstCasePoints(scene, output)
	}));
	const times = [...new Set(lanes.flatMap((lane) => lane.points.map((p) => p.tMs)))].sort(
		(a, b) => a - b
	);
	let peak: PeakCurrent = { amps: 0, atMs: 0, outputIds: [] };
	for (const t of times) {
		const sides = lanes.map((lane) => sidesAt(lane.points, t));
		for (const side of [0, 1]) {
			const amps = lanes.reduce(
				(sum, lane, i) => sum + lane.output.currentAtFull * sides[i][side],
				0
			);
			if (amps > peak.amps + TOLERANCE) {
				const outputIds = lanes.filter((_, i) => sides[i][side] > 0).map((lane) => lane.output.id);
				peak = { amps, atMs: t, outputIds };
			}
		}
	}
	return peak;
}

/** Spans where a relay's timeline is on. */
export function relayOnPeriods(points: TimelinePoint[]): OnPeriod[] {
	const periods: OnPeriod[] = [];
	let start: number | null = null;
	for (const p of points) {
		if (p.level > 0 && start === null) start = p.tMs;
		if (p.level <= 0 && start !== null) {
			periods.push({ startMs: start, endMs: p.tMs, onAtEnd: false });
			start = null;
		}
	}
	const end = points.at(-1)?.tMs ?? 0;
	if (start !== null) periods.push({ startMs: start, endMs: end, onAtEnd: true });
	return periods;
}

const seconds = (ms: number) => `${Number((ms / 1000).toFixed(2))} s`;
const amps = (a: number) => `${Number(a.toFixed(2))} A`;
const count = (n: number) => (Number.isInteger(n) ? String(n) : n.toFixed(1));
const percent = (level: number) => `${Math.round(level * 100)} %`;
const depthWords = (depth: number) => `${Math.round(depth * 100)} % deep`;
/** 'a', 'a and b', 'a, b and c'. */
const list = (items: string[]) =>
	items.length < 2 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items.at(-1)}`;
const capital = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);
const describeCue = (cue: Cue) => `the ${cue.action.type} at ${seconds(cue.startMs)}`;
const ORDER: Record<Severity, number> = { error: 0, warning: 1, info: 2 };

/** Cues of an output that act at some moment inside [fromMs, toMs]. */
function cuesBetween(scene: Scene, outputId: string, fromMs: number, toMs: number): string[] {
	return cuesFor(scene, outputId)
		.filter((cue) => cue.startMs <= toMs && cueEndMs(cue) >= fromMs)
		.map((cue) => cue.id);
}

/** What every rule reads: the scene, its outputs and what is worked out once for all the rules. */
export interface RuleContext {
	scene: Scene;
	outputs: Output[];
	options: SceneCheckOptions;
	byId: Map<string, Output>;
	/** An output's name in quotes, or its id when it does not exist. */
	name: (id: string) => string;
	/** The outputs that a cue or a response uses. */
	used: Output[];
	luminance: (output: Output, level: number) => number;
	/** The used LEDs and strobe relays... */
	lights: Output[];
	/** ...and each one's luminance over the scene, worked out on first use. */
	lightPoints: TimelinePoint[][];
}

/** One rule of the scene checks: its findings in the order it finds them. */
export type SceneRule = (c: RuleContext) => Finding[];

const finding = (
	code: FindingCode,
	severity: Severity,
	message: string,
	cueIds: string[] = [],
	outputIds: string[] = []
): Finding => ({ code, severity, message, cueIds, outputIds });

export function ruleContext(
	scene: Scene,
	outputs: Output[],
	options: SceneCheckOptions = {}
): RuleContext {
	const byId = new Map(outputs.map((output) => [output.id, output]));
	const used = usedOutputs(scene, outputs);
	const luminance = options.luminance ?? ((_: Output, level: number) => level);
	const lights = used.filter(
		(o) => o.kind === 'led' || (o.kind === 'relay' && o.relayKind === 'strobe')
	);
	let lightPoints: TimelinePoint[][] | undefined;
	return {
		scene,
		outputs,
		options,
		byId,
		name: (id) => `'${byId.get(id)?.name ?? id}'`,
		used,
		luminance,
		lights,
		get lightPoints() {
			lightPoints ??= lights.map((output) =>
				output.kind === 'led'
					? timelinePoints(scene, output.id, { kind: 'led' }).map((p) => ({
							tMs: p.tMs,
							level: luminance(output, p.level)
						}))
					: timelinePoints(scene, output.id, { kind: 'relay' })
			);
			return lightPoints;
		}
	};
}

/** A length of more than 0 and a re-arm of 0 or more; without them no other rule can run. */
export function sceneTimesRule({ scene }: RuleContext): Finding[] {
	const found: Finding[] = [];
	if (!(Number.isFinite(scene.lengthMs) && scene.lengthMs > 0))
		found.push(finding('scene-invalid', 'error', 'The scene needs a length of more than 0 s.'));
	if (!(Number.isFinite(scene.rearmMs) && scene.rearmMs >= 0))
		found.push(finding('scene-invalid', 'error', 'The re-arm time must be 0 s or more.'));
	return found;
}

/** Each cue in turn: its output exists, it can run, it ends within the scene, a relay is not faded. */
export function cuesRule({ scene, byId, name }: RuleContext): Finding[] {
	const found: Finding[] = [];
	for (const cue of scene.cues) {
		const onCue = (code: FindingCode, severity: Severity, message: string) =>
			finding(code, severity, message, [cue.id], [cue.outputId]);
		if (!byId.has(cue.outputId)) {
			const message = `A cue uses an output that does not exist (${cue.outputId}).`;
			found.push(onCue('unknown-output', 'error', message));
			continue;
		}
		const problem = cueProblem(cue);
		if (problem) {
			const message = `A cue on ${name(cue.outputId)} cannot run: ${problem}.`;
			found.push(onCue('cue-invalid', 'error', message));
			continue;
		}
		if (cueEndMs(cue) > scene.lengthMs) {
			const message = `${capital(describeCue(cue))} on ${name(cue.outputId)} runs to ${seconds(cueEndMs(cue))}, past the scene's ${seconds(scene.lengthMs)} length.`;
			found.push(onCue('cue-past-end', 'warning', message));
		}
		if (cue.action.type === 'fade' && byId.get(cue.outputId)?.kind === 'relay') {
			const message = `${name(cue.outputId)} is a relay and can only switch; ${describeCue(cue)} will switch at its end.`;
			found.push(onCue('relay-fade', 'warning', message));
		}
	}
	return found;
}

/** Every response drives an output that exists. */
export function responseOutputsRule({ scene, byId }: RuleContext): Finding[] {
	return (scene.responses ?? [])
		.filter((response) => !byId.has(response.outputId))
		.map((response) =>
			finding(
				'unknown-output',
				'error',
				`A response uses an output that does not exist (${response.outputId}).`,
				[],
				[response.outputId]
			)
		);
}

/** Cues on one output whose times overlap. */
export function cueOverlapRule({ scene, byId, name }: RuleContext): Finding[] {
	return findCueOverlaps(scene)
		.filter((overlap) => byId.has(overlap.outputId))
		.map((overlap) =>
			finding(
				'cue-overlap',
				'warning',
				`${capital(describeCue(overlap.first))} and ${describeCue(overlap.second)} on ${name(overlap.outputId)} overlap; the later cue takes over.`,
				[overlap.first.id, overlap.second.id],
				[overlap.outputId]
			)
		);
}

/** Every output used has a safe state. */
export function safeStateRule({ used, name }: RuleContext): Finding[] {
	return used
		.filter((output) => !output.safeState?.trim())
		.map((output) =>
			finding(
				'safe-state-missing',
				'error',
				`${name(output.id)} has no safe state. Every output used needs one: what it does on alarm or stop (lights to full, relays de-energised, fog and audio off).`,
				[],
				[output.id]
			)
		);
}

/** An LED flashing more than 3 times in a second. */
export function lampFlashRule({ scene, lights, lightPoints, name }: RuleContext): Finding[] {
	const found: Finding[] = [];
	lights.forEach((output, i) => {
		if (output.kind !== 'led') return;
		const worst = maxFlashesPerSecond(lightPoints[i]);
		if (worst.flashes <= MAX_FLASHES_PER_SECOND) return;
		found.push(
			finding(
				'flash-rate',
				'warning',
				`${name(output.id)} flashes ${count(worst.flashes)} times in one second (from ${seconds(worst.fromMs)}). More than 3 flashes a second can trigger seizures in people with photosensitive epilepsy (WCAG 2.3.1): slow it to 3 or fewer, or post photosensitivity warning signage before guests enter.`,
				cuesBetween(scene, output.id, worst.fromMs, worst.fromMs + 1000),
				[output.id]
			)
		);
	});
	return found;
}

/**
 * Lights flashing more than 3 times in a second together. Every light of a scene is in the same
 * room and so in the guests' view at once: WCAG 2.3.1 counts the flashes a viewer sees, not those
 * of each lamp, so they are counted together too.
 */
export function roomFlashRule({ scene, lights, lightPoints, name }: RuleContext): Finding[] {
	if (lights.length < 2) return [];
	const together = maxFlashesPerSecondTogether(lightPoints);
	const alone = Math.max(...lightPoints.map((points) => maxFlashesPerSecond(points).flashes));
	if (together.flashes <= MAX_FLASHES_PER_SECOND || together.flashes <= alone) return [];
	const inWindow = lights.filter((_, i) =>
		flashTransitions(lightPoints[i]).some((t) => t >= together.fromMs && t < together.fromMs + 1000)
	);
	return [
		finding(
			'flash-rate',
			'warning',
			`Together, ${list(inWindow.map((o) => name(o.id)))} flash ${count(together.flashes)} times in one second (from ${seconds(together.fromMs)}). Lights in one room are seen at once, so their flashes add up (WCAG 2.3.1): stagger or slow them to 3 or fewer a second, or post photosensitivity warning signage before guests enter.`,
			inWindow.flatMap((o) => cuesBetween(scene, o.id, together.fromMs, together.fromMs + 1000)),
			inWindow.map((o) => o.id)
		)
	];
}

/**
 * A light that jumps when a sensor crosses a depth flickers as fast as the reading wavers about
 * that depth (a guest lingering there, or noise): its worst case has no limit.
 */
export function responseFlickerRule({ scene, byId, luminance, name }: RuleContext): Finding[] {
	const found: Finding[] = [];
	for (const response of scene.responses ?? []) {
		const output = byId.get(response.outputId);
		if (!output || output.kind !== 'led') continue;
		const jump = responseJumps(response).find((j) => {
			const [dim, bright] = [luminance(output, j.low), luminance(output, j.high)];
			return bright - dim >= FLASH_CHANGE - TOLERANCE && dim < FLASH_DARKER_BELOW;
		});
		if (!jump) continue;
		found.push(
			finding(
				'flash-rate',
				'warning',
				`${name(output.id)} jumps between ${percent(jump.low)} and ${percent(jump.high)} when the sensor reads ${depthWords(jump.depth)}: a guest lingering there, or a wavering reading, can make it flicker more than 3 times a second (WCAG 2.3.1). Give the board's code a dead band or a minimum time between changes, use a gradual shape, or post photosensitivity warning signage before guests enter.`,
				[],
				[output.id]
			)
		);
	}
	return found;
}

/** A relay that switches a strobe light. */
export function strobeLightRule({ scene, used, name }: RuleContext): Finding[] {
	return used
		.filter((o) => o.kind === 'relay' && o.relayKind === 'strobe')
		.map((output) =>
			finding(
				'strobe-light',
				'warning',
				`${name(output.id)} switches a strobe light. Unless it flashes 3 times a second or fewer, post photosensitivity warning signage before guests enter (WCAG 2.3.1), and keep it away from stairs and exits.`,
				scene.cues.filter((cue) => cue.outputId === output.id).map((cue) => cue.id),
				[output.id]
			)
		);
}

/** The peak current against the supply's rating and 80 % of it; a note when no rating is set. */
export function supplyCurrentRule({ scene, outputs, options }: RuleContext): Finding[] {
	const peak = peakCurrent(scene, outputs);
	const supply = options.supplyAmps;
	const say = (severity: Severity, message: string) =>
		finding('supply-current', severity, message, [], peak.outputIds);
	if (supply === undefined || !(supply > 0))
		return [
			say(
				'info',
				`Peak current ${amps(peak.amps)} at ${seconds(peak.atMs)}. Set the supply rating to check it.`
			)
		];
	const usable = supply * SUPPLY_DERATING;
	const where = `${amps(peak.amps)} at ${seconds(peak.atMs)}`;
	if (peak.amps > supply + TOLERANCE)
		return [
			say('error', `Peak current ${where} is more than the supply's ${amps(supply)} rating.`)
		];
	if (peak.amps > usable + TOLERANCE)
		return [
			say(
				'warning',
				`Peak current ${where} is above ${amps(usable)}, 80 % of the supply's ${amps(supply)} rating. Use a larger supply or stagger the cues.`
			)
		];
	return [
		say(
			'info',
			`Peak current ${where}, within ${amps(usable)} (80 % of the supply's ${amps(supply)} rating).`
		)
	];
}

/** A cycle longer than the dispatch interval sets the pace of the attraction. */
export function cycleOverDispatchRule({ scene, options }: RuleContext): Finding[] {
	const cycle = cycleMs(scene);
	const { dispatchIntervalS: dispatchS, groupSize: group } = options;
	if (!(dispatchS !== undefined && dispatchS > 0 && cycle > dispatchS * 1000)) return [];
	const cycleText = `The cycle (${seconds(scene.lengthMs)} length + ${seconds(scene.rearmMs)} re-arm = ${seconds(cycle)})`;
	const limit =
		group !== undefined && group > 0
			? `: ${Math.floor(throughputPerHour(group, dispatchS, cycle / 1000))} guests per hour instead of ${Math.floor(throughputPerHour(group, dispatchS))}`
			: '';
	return [
		finding(
			'cycle-over-dispatch',
			'warning',
			`${cycleText} is longer than the ${seconds(dispatchS * 1000)} dispatch interval, so this scene sets the pace${limit}.`
		)
	];
}

/** Guests per hour, when the group size is known. */
export function throughputRule({ scene, options }: RuleContext): Finding[] {
	const group = options.groupSize;
	if (group === undefined || !(group > 0)) return [];
	const interval = Math.max(options.dispatchIntervalS ?? 0, cycleMs(scene) / 1000);
	return [
		finding(
			'throughput',
			'info',
			`${Math.floor(throughputPerHour(group, interval))} guests per hour (groups of ${group} every ${seconds(interval * 1000)}).`
		)
	];
}

/** One relay's on periods over the timeline, and the cues acting in some of them. */
interface RelayRun {
	output: Output;
	endMs: number;
	periods: OnPeriod[];
	cueIds: (periods: { startMs: number; endMs: number }[]) => string[];
}

function relayMinOn({ output, periods, cueIds }: RelayRun, name: RuleContext['name']) {
	if (output.minOnMs === undefined) return [];
	const minOn = output.minOnMs;
	const short = periods.filter((p) => !p.onAtEnd && p.endMs - p.startMs < minOn - TOLERANCE);
	if (short.length === 0) return [];
	const least = Math.min(...short.map((p) => p.endMs - p.startMs));
	return [
		finding(
			'relay-min-on',
			'error',
			`${name(output.id)} is on for as little as ${seconds(least)} (${short.length} time${short.length === 1 ? '' : 's'}), under its ${seconds(minOn)} minimum on time.`,
			cueIds(short),
			[output.id]
		)
	];
}

function relayMinOff(run: RelayRun, name: RuleContext['name'], rearmMs: number) {
	const { output, periods, cueIds, endMs } = run;
	if (output.minOffMs === undefined) return [];
	const minOff = output.minOffMs;
	const gaps: { startMs: number; endMs: number }[] = [];
	for (let i = 1; i < periods.length; i++)
		gaps.push({ startMs: periods[i - 1].endMs, endMs: periods[i].startMs });
	const last = periods.at(-1)!;
	const wrap = last.onAtEnd ? null : endMs - last.endMs + rearmMs + periods[0].startMs;
	const short = gaps.filter((g) => g.endMs - g.startMs < minOff - TOLERANCE);
	const wrapShort = wrap !== null && wrap < minOff - TOLERANCE;
	if (short.length === 0 && !wrapShort) return [];
	const least = Math.min(...short.map((g) => g.endMs - g.startMs), wrapShort ? wrap! : Infinity);
	const note = wrapShort ? ' (counting the gap into the next run of the scene)' : '';
	return [
		finding(
			'relay-min-off',
			'error',
			`${name(output.id)} is off for as little as ${seconds(least)}${note}, under its ${seconds(minOff)} minimum off time.`,
			cueIds([...short, ...(wrapShort ? [periods[0], last] : [])]),
			[output.id]
		)
	];
}

function relayDuty(
	{ output, periods, cueIds, endMs }: RelayRun,
	name: RuleContext['name'],
	rearmMs: number
) {
	if (output.maxDutyPercent === undefined) return [];
	const on = periods.reduce((sum, p) => sum + p.endMs - p.startMs, 0);
	const duty = (100 * on) / (endMs + rearmMs);
	if (duty <= output.maxDutyPercent + TOLERANCE) return [];
	return [
		finding(
			'relay-duty',
			'error',
			`${name(output.id)} is on ${Number(duty.toFixed(1))} % of each cycle, above its ${output.maxDutyPercent} % duty rating.`,
			cueIds(periods),
			[output.id]
		)
	];
}

function relayOnAtEnd({ output, periods, cueIds }: RelayRun, name: RuleContext['name']) {
	const last = periods.at(-1)!;
	if (!last.onAtEnd) return [];
	return [
		finding(
			'relay-on-at-end',
			'warning',
			`${name(output.id)} is still on when the scene ends and stays on through the re-arm.`,
			cueIds([last]),
			[output.id]
		)
	];
}

/** Each relay in turn against its minimum on and off times and its duty rating, and left on at the end. */
export function relayTimingRule({ scene, used, name }: RuleContext): Finding[] {
	const endMs = timelineEndMs(scene);
	return used
		.filter((o) => o.kind === 'relay')
		.flatMap((output) => {
			const periods = relayOnPeriods(timelinePoints(scene, output.id, { kind: 'relay', endMs }));
			if (periods.length === 0) return [];
			const cueIds = (list: { startMs: number; endMs: number }[]) => [
				...new Set(list.flatMap((p) => cuesBetween(scene, output.id, p.startMs, p.endMs)))
			];
			const run: RelayRun = { output, endMs, periods, cueIds };
			return [
				...relayMinOn(run, name),
				...relayMinOff(run, name, scene.rearmMs),
				...relayDuty(run, name, scene.rearmMs),
				...relayOnAtEnd(run, name)
			];
		});
}

/** The rules in the order their findings are listed (within a severity). */
export const SCENE_RULES: readonly { name: string; check: SceneRule; stopsTheRest?: true }[] = [
	{ name: 'scene times', check: sceneTimesRule, stopsTheRest: true },
	{ name: 'cues', check: cuesRule },
	{ name: 'response outputs', check: responseOutputsRule },
	{ name: 'cue overlaps', check: cueOverlapRule },
	{ name: 'safe states', check: safeStateRule },
	{ name: 'lamp flashes', check: lampFlashRule },
	{ name: 'room flashes', check: roomFlashRule },
	{ name: 'response flicker', check: responseFlickerRule },
	{ name: 'strobe lights', check: strobeLightRule },
	{ name: 'supply current', check: supplyCurrentRule },
	{ name: 'cycle over dispatch', check: cycleOverDispatchRule },
	{ name: 'throughput', check: throughputRule },
	{ name: 'relay timing', check: relayTimingRule }
];

/** Every check of a scene, errors first; a scene without a usable length or re-arm gets only that. */
export function checkScene(
	scene: Scene,
	outputs: Output[],
	options: SceneCheckOptions = {}
): Finding[] {
	const context = ruleContext(scene, outputs, options);
	const findings: Finding[] = [];
	for (const rule of SCENE_RULES) {
		const found = rule.check(context);
		findings.push(...found);
		if (rule.stopsTheRest && found.length > 0) return findings;
	}
	return findings
		.map((finding, index) => ({ finding, index }))
		.sort((a, b) => ORDER[a.finding.severity] - ORDER[b.finding.severity] || a.index - b.index)
		.map(({ finding }) => finding);
}

/** True when findings call for photosensitivity warning signage. */
export function needsStrobeSignage(findings: Finding[]): boolean {
	return findings.some((f) => f.code === 'flash-rate' || f.code === 'strobe-light');
}
