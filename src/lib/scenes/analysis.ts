import { applyCurve } from '../curves/curve';
import {
	checkScene,
	cycleMs,
	needsStrobeSignage,
	peakCurrent,
	relayOnPeriods,
	throughputPerHour
} from './checks';
import { timelineEndMs, timelinePoints } from './timeline';
import type { PreviewOutput } from './preview';
import type { Finding, Scene } from './types';

/** A supply feeding some of the scene's outputs (a controller's supply rating). */
export interface Supply {
	id: string;
	name: string;
	amps: number;
}

export interface AnalysisOutput extends PreviewOutput {
	supplyId?: string | null;
}

export interface AnalysisOptions {
	supplies?: Supply[];
	dispatchIntervalS?: number;
	groupSize?: number;
}

export interface SceneAnalysis {
	findings: Finding[];
	errors: number;
	warnings: number;
	/** Photosensitivity signage belongs on the show's checklist. */
	needsStrobeSignage: boolean;
	lengthMs: number;
	cycleMs: number;
	/** Guests per hour the venue's dispatch allows with this scene's cycle, when known. */
	throughputPerHour: number | null;
	/** Share of each cycle (timeline plus re-arm) each relay is on, beside its duty rating. */
	relayDuty: { outputId: string; name: string; percent: number; ratingPercent: number | null }[];
	/** Peak current per supply, and over every output. */
	peaks: {
		supplyId: string | null;
		name: string;
		amps: number;
		atMs: number;
		ratingA: number | null;
	}[];
}

/**
 * Every check of a scene, with the supply current worked out per supply: each output counts
 * against the supply that feeds it. Runs the same in the browser and on the server.
 */
export function analyseScene(
	scene: Scene,
	outputs: AnalysisOutput[],
	options: AnalysisOptions = {}
): SceneAnalysis {
	const luminance = (output: { id: string }, level: number) => {
		const curve = outputs.find((o) => o.id === output.id)?.curve;
		return curve ? applyCurve(curve, level) : level;
	};
	const base = checkScene(scene, outputs, {
		dispatchIntervalS: options.dispatchIntervalS,
		groupSize: options.groupSize,
		luminance
	});
	const findings = base.filter((f) => f.code !== 'supply-current');
	const peaks: SceneAnalysis['peaks'] = [];
	const invalid = base.some((f) => f.code === 'scene-invalid');
	if (!invalid) {
		for (const supply of options.supplies ?? []) {
			const fed = outputs.filter((o) => o.supplyId === supply.id);
			if (fed.length === 0) continue;
			const ids = new Set(fed.map((o) => o.id));
			const part: Scene = {
				...scene,
				cues: scene.cues.filter((c) => ids.has(c.outputId)),
				responses: (scene.responses ?? []).filter((r) => ids.has(r.outputId))
			};
			const peak = peakCurrent(part, fed);
			peaks.push({
				supplyId: supply.id,
				name: supply.name,
				amps: peak.amps,
				atMs: peak.atMs,
				ratingA: supply.amps
			});
			for (const f of checkScene(part, fed, { supplyAmps: supply.amps, luminance })) {
				if (f.code === 'supply-current')
					findings.push({ ...f, message: `${supply.name}: ${f.message}` });
			}
		}
		const all = peakCurrent(scene, outputs);
		peaks.push({
			supplyId: null,
			name: 'All outputs',
			amps: all.amps,
			atMs: all.atMs,
			ratingA: null
		});
	}
	const relayDuty: SceneAnalysis['relayDuty'] = [];
	if (!invalid) {
		const endMs = timelineEndMs(scene);
		for (const o of outputs.filter((x) => x.kind === 'relay')) {
			const on = relayOnPeriods(timelinePoints(scene, o.id, { kind: 'relay', endMs })).reduce(
				(sum, p) => sum + p.endMs - p.startMs,
				0
			);
			relayDuty.push({
				outputId: o.id,
				name: o.name,
				percent: (100 * on) / (endMs + scene.rearmMs),
				ratingPercent: o.maxDutyPercent ?? null
			});
		}
	}
	const order = { error: 0, warning: 1, info: 2 };
	findings.sort((a, b) => order[a.severity] - order[b.severity]);
	const cycle = cycleMs(scene);
	const group = options.groupSize;
	const dispatch = options.dispatchIntervalS;
	return {
		findings,
		errors: findings.filter((f) => f.severity === 'error').length,
		warnings: findings.filter((f) => f.severity === 'warning').length,
		needsStrobeSignage: needsStrobeSignage(findings),
		lengthMs: scene.lengthMs,
		cycleMs: cycle,
		throughputPerHour:
			!invalid && group && group > 0 && dispatch && dispatch > 0
				? Math.floor(throughputPerHour(group, dispatch, cycle / 1000))
				: null,
		peaks,
		relayDuty
	};
}
