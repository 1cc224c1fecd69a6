export type OutputKind = 'led' | 'relay';
export type RelayKind = 'pneumatic' | 'solenoid' | 'fog' | 'audio' | 'strobe';

/** An actuated channel: a PWM LED string or a relay. */
export interface Output {
	id: string;
	name: string;
	kind: OutputKind;
	relayKind?: RelayKind;
	/** Amps drawn at level 1 (LED string) or while on (relay coil plus any load on the same supply). */
	currentAtFull: number;
	/** What the output does on alarm or stop, such as 'full' or 'de-energised'. */
	safeState?: string | null;
	minOnMs?: number;
	minOffMs?: number;
	maxDutyPercent?: number;
}

/** Levels run 0..1; a relay is on at any level above 0. */
export type CueAction =
	| { type: 'set'; level: number }
	/** From the level at the cue's start to this level, in a straight line. */
	| { type: 'fade'; level: number; durationMs: number }
	/** Full (relay on) for the duration, then back to whatever the timeline holds. */
	| { type: 'pulse'; durationMs: number }
	/** Flicker/strobe: on at the level for half of each period, off for the other half. */
	| { type: 'strobe'; rateHz: number; durationMs: number; level: number };

export type CueType = CueAction['type'];

/** One timed action on one output. */
export interface Cue {
	id: string;
	outputId: string;
	startMs: number;
	action: CueAction;
}

/** How depth becomes level: rises with depth, steps at a threshold, falls with depth, or drawn points. */
export type ResponseShape = 'rise' | 'step' | 'fall' | 'points';

/** A live link from a sensor's depth (0..1) to an output's level. */
export interface Response {
	id: string;
	sensorId: string;
	outputId: string;
	/** 'rise' when not given. */
	shape?: ResponseShape;
	/** Depth at which a 'step' switches from the low to the high level; 0.5 when not given. */
	threshold?: number | null;
	/** Drawn [depth, level] pairs for 'points'; straight lines between them, end levels held. */
	points?: [number, number][] | null;
	/** The low level (at depth 0 when rising, at depth 1 when falling); defaults to 0. */
	minLevel?: number;
	/** The high level (at depth 1 when rising, at depth 0 when falling); defaults to 1. */
	maxLevel?: number;
}

export interface Scene {
	lengthMs: number;
	rearmMs: number;
	cues: Cue[];
	responses?: Response[];
}

export type Severity = 'error' | 'warning' | 'info';

export type FindingCode =
	| 'scene-invalid'
	| 'cue-invalid'
	| 'unknown-output'
	| 'cue-past-end'
	| 'cue-overlap'
	| 'relay-fade'
	| 'flash-rate'
	| 'strobe-light'
	| 'supply-current'
	| 'safe-state-missing'
	| 'cycle-over-dispatch'
	| 'throughput'
	| 'relay-min-on'
	| 'relay-min-off'
	| 'relay-duty'
	| 'relay-on-at-end';

export interface Finding {
	code: FindingCode;
	severity: Severity;
	message: string;
	cueIds: string[];
	outputIds: string[];
}
