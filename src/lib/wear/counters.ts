import type { CueAction } from '../scenes/types';

/**
 * Wear counters (design item 11): how much each output has worked over the counted nights, against
 * the rated life and the maintenance interval its designer set. Pure, shared by server and browser.
 *
 * The rule, also written on the show and output pages:
 * - Every scene that runs on a night runs once per group of guests (groups = guests / guests per
 *   group, rounded up, or the number of groups entered at close).
 * - In one run of a scene, each cue on the output is one actuation, except a strobe cue, which is
 *   one actuation per flash (rate × duration, rounded up); each response from a sensor to the
 *   output counts one actuation per run (the guest passes through once).
 * - Triggers per group for the output = the sum of those over the night's scenes that use it;
 *   actuations per night = triggers per group × groups.
 * - Fog counts hours of running instead: the durations of its pulse, fade and strobe cues, and a set
 *   cue above zero runs until the scene ends; hours per night = that time per run × groups.
 * - A prop stood down for the night holds its outputs in the safe state: they count nothing.
 */

export const WEAR_KINDS = ['operations', 'seal_cycles', 'fog_hours'] as const;
export type WearKind = (typeof WEAR_KINDS)[number];
export const WEAR_KIND_LABELS: Record<WearKind, string> = {
	operations: 'Relay electrical life (operations)',
	seal_cycles: 'Cylinder seal cycles',
	fog_hours: 'Fog machine running hours between cleanings'
};
/** The unit a counter of this kind is written in. */
export const WEAR_UNITS: Record<WearKind, string> = {
	operations: 'operations',
	seal_cycles: 'cycles',
	fog_hours: 'h'
};

/** What a designer would usually choose for an output of this relay kind. */
export function wearKindFor(relayKind: string | null): WearKind {
	if (relayKind === 'fog') return 'fog_hours';
	if (relayKind === 'pneumatic') return 'seal_cycles';
	return 'operations';
}

export interface WearScene {
	id: string;
	lengthMs: number;
	cues: { outputId: string; startMs: number; action: CueAction }[];
	responses: { outputId: string }[];
}

export interface PerRun {
	/** Actuations of the output in one run of the night's scenes (triggers per group). */
	actuations: number;
	/** Milliseconds the output is on in one run (used for fog). */
	onMs: number;
}

/** Triggers per group and running time per group of one output over the given scenes. */
export function perGroup(outputId: string, scenes: WearScene[]): PerRun {
	let actuations = 0;
	let onMs = 0;
	for (const s of scenes) {
		const cues = s.cues
			.filter((c) => c.outputId === outputId)
			.sort((a, b) => a.startMs - b.startMs);
		cues.forEach((c, i) => {
			const a = c.action;
			if (a.type === 'strobe') {
				actuations += Math.ceil((a.rateHz * a.durationMs) / 1000);
				onMs += a.durationMs;
			} else {
				actuations += 1;
				if (a.type === 'pulse' || a.type === 'fade') onMs += a.durationMs;
				else if (a.level > 0) {
					const next = cues[i + 1]?.startMs ?? s.lengthMs;
					onMs += Math.max(0, next - c.startMs);
				}
			}
		});
		actuations += s.responses.filter((r) => r.outputId === outputId).length;
	}
	return { actuations, onMs };
}

/** Groups through on a night: entered directly, or guests over guests per group rounded up. */
export function groupsOf(count: {
	guests: number;
	groups: number | null;
	groupSize: number | null;
}) {
	if (count.groups !== null) return count.groups;
	if (count.groupSize && count.groupSize > 0) return Math.ceil(count.guests / count.groupSize);
	return 0;
}

export interface CountedNight {
	showId: string;
	/** When the night ended (doors close), for ordering against maintenance records. */
	endsAt: Date;
	groups: number;
	/** The scenes that ran that night. */
	scenes: WearScene[];
	/** Outputs of props stood down that night (held in their safe state). */
	idleOutputs?: string[];
}

export interface WearSetting {
	kind: WearKind;
	/** The maker's rated life in the kind's unit (operations, cycles, hours). */
	ratedLife: number;
	/** Maintenance every this many units. */
	interval: number;
}

export interface WearCounter {
	kind: WearKind;
	unit: string;
	/** Over every counted night. */
	total: number;
	/** Since the last maintenance record (or since counting began). */
	sinceMaintenance: number;
	ratedLife: number;
	interval: number;
	/** Share of the rated life used, 0..1 or more. */
	lifeUsed: number;
	due: boolean;
	nights: { showId: string; groups: number; perGroup: number; amount: number }[];
}

/** One night's amount for an output in the counter's unit. */
export function nightAmount(kind: WearKind, run: PerRun, groups: number): number {
	return kind === 'fog_hours' ? (run.onMs * groups) / 3_600_000 : run.actuations * groups;
}

/**
 * An output's counter over the counted nights. Nights that ended at or before the last maintenance
 * count towards the total only.
 */
export function wearCounter(
	outputId: string,
	setting: WearSetting,
	nights: CountedNight[],
	lastMaintenance: Date | null
): WearCounter {
	let total = 0;
	let since = 0;
	const rows: WearCounter['nights'] = [];
	for (const n of [...nights].sort((a, b) => a.endsAt.getTime() - b.endsAt.getTime())) {
		const run = n.idleOutputs?.includes(outputId)
			? { actuations: 0, onMs: 0 }
			: perGroup(outputId, n.scenes);
		const amount = nightAmount(setting.kind, run, n.groups);
		total += amount;
		if (!lastMaintenance || n.endsAt > lastMaintenance) since += amount;
		rows.push({
			showId: n.showId,
			groups: n.groups,
			perGroup: setting.kind === 'fog_hours' ? run.onMs / 3_600_000 : run.actuations,
			amount
		});
	}
	return {
		kind: setting.kind,
		unit: WEAR_UNITS[setting.kind],
		total,
		sinceMaintenance: since,
		ratedLife: setting.ratedLife,
		interval: setting.interval,
		lifeUsed: setting.ratedLife > 0 ? total / setting.ratedLife : 0,
		due: setting.interval > 0 && since >= setting.interval,
		nights: rows
	};
}
