import { figure } from '../quantity';
/** What a sensor test reads against: the thresholds stored when a capture's calibration was applied. */
export interface ReadingBand {
	/** 'up' when a present reading is higher than idle. */
	direction: 'up' | 'down';
	enter: number;
	exit: number;
	baselineLow: number;
	baselineHigh: number;
}

export type Outcome = 'pass' | 'fail';

export interface SensorTestVerdict {
	outcome: Outcome;
	idleInBand: boolean;
	presentCrosses: boolean;
	/** Why it failed, in words for the crew; empty on a pass. */
	reasons: string[];
}

/** Readings to five significant figures, grouped: enough to tell a reading from a band's edge. */
function fmt(n: number): string {
	return figure(n, 5);
}

/** The idle reading sits inside the baseline band (ends included). */
export function idleInBand(band: ReadingBand, idle: number): boolean {
	return Number.isFinite(idle) && idle >= band.baselineLow && idle <= band.baselineHigh;
}

/** The present reading reaches the enter threshold on the side present readings lie. */
export function presentCrosses(band: ReadingBand, present: number): boolean {
	if (!Number.isFinite(present)) return false;
	return band.direction === 'up' ? present >= band.enter : present <= band.enter;
}

/**
 * A pre-show sensor test: it passes when the idle reading sits inside the calibrated baseline band
 * and the present reading crosses the enter threshold (design item 8).
 */
export function evaluateSensorTest(
	band: ReadingBand,
	idle: number,
	present: number
): SensorTestVerdict {
	const reasons: string[] = [];
	const idleOk = idleInBand(band, idle);
	const presentOk = presentCrosses(band, present);
	if (!Number.isFinite(idle)) reasons.push('The idle reading is missing.');
	else if (!idleOk)
		reasons.push(
			`Idle reading ${fmt(idle)} is ${idle < band.baselineLow ? 'below' : 'above'} the baseline band ${bandText(band)}.`
		);
	if (!Number.isFinite(present)) reasons.push('The present reading is missing.');
	else if (!presentOk)
		reasons.push(
			`Present reading ${fmt(present)} does not reach the enter threshold (${enterText(band)}).`
		);
	return {
		outcome: idleOk && presentOk ? 'pass' : 'fail',
		idleInBand: idleOk,
		presentCrosses: presentOk,
		reasons
	};
}

export function bandText(band: ReadingBand): string {
	return `${fmt(band.baselineLow)} to ${fmt(band.baselineHigh)}`;
}

export function enterText(band: ReadingBand): string {
	return `${fmt(band.enter)} or ${band.direction === 'up' ? 'more' : 'less'}`;
}
