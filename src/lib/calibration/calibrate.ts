import { normalUpperTail } from './erfc';
import { slopeIsSignificant } from './student-t';

export interface LabelStats {
	count: number;
	mean: number;
	sigma: number;
}

export interface CalibrationInput {
	idle: LabelStats;
	present: LabelStats;
	/** Readings per second, for false triggers per hour. */
	updateRateHz?: number | null;
	driftPerMinute?: number | null;
	/** Standard error of the drift slope; without it a drift is never taken as established. */
	driftStandardErrorPerMinute?: number | null;
	/** Degrees of freedom of the drift fit (idle readings - 2). */
	driftDegreesOfFreedom?: number | null;
}

/** Statistics that cannot be calibrated on, in words for the person who uploaded them. */
export class CalibrationInputError extends RangeError {}

export interface CalibrationOptions {
	/** Enter threshold distance from the idle mean, in idle sigmas. */
	enterSigmas?: number;
	/** Exit threshold as a fraction of the way from the idle mean to the enter threshold. */
	exitFraction?: number;
	/** Smallest step of the reading (1 for timer counts); sigma is never taken below step/sqrt 12. */
	resolution?: number;
}

export type Direction = 'up' | 'down';

export interface DepthMapping {
	/** Reading at depth 0. */
	far: number;
	/** Reading at depth 1. */
	near: number;
}

export type CalibrationWarningCode =
	| 'few-readings'
	| 'low-separation'
	| 'marginal-separation'
	| 'enter-at-balance'
	| 'sigma-floor'
	| 'false-triggers'
	| 'misses'
	| 'drift';

export interface CalibrationWarning {
	code: CalibrationWarningCode;
	message: string;
}

export interface Calibration {
	/** 'up' when present readings are higher than idle (capacitive RC counts rise with a hand). */
	direction: Direction;
	/** d' = |present mean - idle mean| / sqrt((idle sigma^2 + present sigma^2) / 2). */
	separation: number;
	idleSigma: number;
	presentSigma: number;
	enter: number;
	exit: number;
	/** Idle readings expected here; a pre-show idle reading outside it fails the sensor test. */
	baselineBand: { low: number; high: number };
	/** z of the enter threshold above the idle mean, in idle sigmas. */
	enterSigmas: number;
	/** Chance one idle update crosses the enter threshold. */
	falseTriggerPerUpdate: number;
	falseTriggersPerHour: number | null;
	/** Chance one present update falls short of the enter threshold. */
	missProbability: number;
	driftPerMinute: number | null;
	/** True when the drift differs from none at the 5 % level (t test on the slope). */
	driftSignificant: boolean;
	depth: DepthMapping;
	warnings: CalibrationWarning[];
}

export const DEFAULT_ENTER_SIGMAS = 5;
export const DEFAULT_EXIT_FRACTION = 0.5;

// Trade rules of thumb for the warnings. Common practice, no published source.
const MIN_READINGS = 30;
const LOW_SEPARATION = 3;
const MARGINAL_SEPARATION = 6;
const MAX_FALSE_TRIGGERS_PER_HOUR = 1;
const MAX_MISS_PROBABILITY = 0.01;
const DRIFT_HORIZON_MINUTES = 60;

function fmt(value: number, digits = 3): string {
	return Number(value.toPrecision(digits)).toLocaleString('en', {
		maximumSignificantDigits: digits
	});
}

/**
 * Thresholds from idle and present statistics. The rule, on the side the present readings lie:
 * - enter sits enterSigmas idle sigmas from the idle mean (5 by default: about 2.9e-7 false
 *   triggers per update), unless that reaches past the balance point, the one equally many own
 *   sigmas from both means; then enter sits at the balance point and a warning says so;
 * - exit sits exitFraction (half by default) of the way from the idle mean to enter, so the
 *   hysteresis band is the other half and noise at the enter threshold does not chatter;
 * - depth runs from the exit threshold (0) to the present mean (1).
 */
export function calibrate(input: CalibrationInput, options: CalibrationOptions = {}): Calibration {
	const {
		enterSigmas: k = DEFAULT_ENTER_SIGMAS,
		exitFraction = DEFAULT_EXIT_FRACTION,
		resolution = 1
	} = options;
	if (!(k > 0)) throw new RangeError(`enter sigmas ${k} must be above 0`);
	if (!(exitFraction >= 0 && exitFraction < 1))
		throw new RangeError(`exit fraction ${exitFraction} must be in 0..1`);
	if (!(resolution > 0)) throw new RangeError(`resolution ${resolution} must be above 0`);

	const { idle, present } = input;
	if (!(idle.count > 0 && present.count > 0))
		throw new RangeError('calibration needs both idle and present readings');
	for (const [label, stats] of [
		['idle', idle],
		['present', present]
	] as const) {
		if (!Number.isFinite(stats.mean) || !Number.isFinite(stats.sigma) || stats.sigma < 0)
			throw new CalibrationInputError(
				`The ${label} readings are too large or too spread out to work with (their ${
					Number.isFinite(stats.mean) ? 'spread' : 'average'
				} cannot be computed). Check the file holds timer counts or sensor readings, not something else.`
			);
	}
	const warnings: CalibrationWarning[] = [];
	for (const [label, stats] of [
		['idle', idle],
		['present', present]
	] as const) {
		if (stats.count < MIN_READINGS)
			warnings.push({
				code: 'few-readings',
				message: `Only ${stats.count} ${label} readings: capture at least ${MIN_READINGS}.`
			});
	}

	// Readings are quantised, so a measured sigma of 0 still hides up to step/sqrt(12) of noise.
	const floor = resolution / Math.sqrt(12);
	const idleSigma = Math.max(idle.sigma || 0, floor);
	const presentSigma = Math.max(present.sigma || 0, floor);
	if ((idle.sigma || 0) < floor || (present.sigma || 0) < floor)
		warnings.push({
			code: 'sigma-floor',
			message: `A spread (sigma) below the reading's own rounding noise of ${fmt(floor)} was raised to it.`
		});

	const direction: Direction = present.mean >= idle.mean ? 'up' : 'down';
	const sign = direction === 'up' ? 1 : -1;
	const gap = Math.abs(present.mean - idle.mean);
	const separation = gap / Math.sqrt((idleSigma ** 2 + presentSigma ** 2) / 2);

	const balance = (gap * idleSigma) / (idleSigma + presentSigma);
	const enterOffset = Math.min(k * idleSigma, balance);
	if (k * idleSigma > balance)
		warnings.push({
			code: 'enter-at-balance',
			message: `${fmt(k)} idle sigmas would reach past the point halfway between idle and present, so the enter threshold sits there instead (${fmt(enterOffset / idleSigma)} sigmas from idle).`
		});
	const exitOffset = exitFraction * enterOffset;
	const enter = idle.mean + sign * enterOffset;
	const exit = idle.mean + sign * exitOffset;

	const enterZ = enterOffset / idleSigma;
	const falseTriggerPerUpdate = normalUpperTail(enterZ);
	const rate = input.updateRateHz ?? null;
	const falseTriggersPerHour = rate ? falseTriggerPerUpdate * rate * 3600 : null;
	const missProbability = normalUpperTail((gap - enterOffset) / presentSigma);

	if (separation < LOW_SEPARATION)
		warnings.push({
			code: 'low-separation',
			message: `The separation d′ of ${fmt(separation)} is too small to calibrate reliably (it needs ${LOW_SEPARATION} or more). Move the plate closer, shield it, or average more readings.`
		});
	else if (separation < MARGINAL_SEPARATION)
		warnings.push({
			code: 'marginal-separation',
			message: `The separation d′ of ${fmt(separation)} is marginal: expect false triggers or misses.`
		});
	if (falseTriggersPerHour !== null && falseTriggersPerHour > MAX_FALSE_TRIGGERS_PER_HOUR)
		warnings.push({
			code: 'false-triggers',
			message: `Expect about ${fmt(falseTriggersPerHour)} false triggers an hour.`
		});
	if (missProbability > MAX_MISS_PROBABILITY)
		warnings.push({
			code: 'misses',
			message: `${fmt(missProbability * 100)} % of present readings fall short of the enter threshold.`
		});

	const drift = input.driftPerMinute ?? null;
	// A slope is only a drift when it stands out from the scatter about it (t test, 5 % level).
	const driftSignificant =
		drift !== null &&
		slopeIsSignificant(
			drift,
			input.driftStandardErrorPerMinute ?? NaN,
			input.driftDegreesOfFreedom ?? NaN
		);
	if (driftSignificant && Math.abs(drift!) * DRIFT_HORIZON_MINUTES > exitOffset) {
		const minutes = exitOffset / Math.abs(drift!);
		warnings.push({
			code: 'drift',
			message: `The idle reading ${drift! > 0 ? 'rises' : 'falls'} by ${fmt(Math.abs(drift!))} a minute, more than its scatter explains, so it would reach the exit threshold in about ${fmt(Math.max(minutes, 1), 2)} minutes. Track the baseline in the board's code, or calibrate again before each show.`
		});
	}

	return {
		direction,
		separation,
		idleSigma,
		presentSigma,
		enter,
		exit,
		baselineBand: { low: idle.mean - exitOffset, high: idle.mean + exitOffset },
		enterSigmas: enterZ,
		falseTriggerPerUpdate,
		falseTriggersPerHour,
		missProbability,
		driftPerMinute: drift,
		driftSignificant,
		depth: { far: exit, near: present.mean },
		warnings
	};
}

/** Depth 0..1 of a reading: 0 at or beyond the far end, 1 at or beyond the near end. */
export function depthOf(reading: number, mapping: DepthMapping): number {
	const depth = (reading - mapping.far) / (mapping.near - mapping.far);
	// No span means no direction to measure depth along.
	if (!Number.isFinite(depth)) return 0;
	return depth < 0 ? 0 : depth > 1 ? 1 : depth;
}
