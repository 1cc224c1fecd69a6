/** One problem with an input, named by the input field it belongs to. */
export type InputIssue = { field: string; message: string };

/** Either a computed value or the list of input problems that stopped the calculation. */
export type Result<T> = { ok: true; value: T } | { ok: false; issues: InputIssue[] };

/**
 * A finding about a design that did compute. `fail` means the part is out of its rating or the
 * design will not work; `warning` means it may not; `info` is a reminder. `basis` names the rule.
 */
export type Check = {
	level: 'fail' | 'warning' | 'info';
	code: string;
	message: string;
	basis: string;
};

export const COMMON_PRACTICE = 'common practice';

export function ok<T>(value: T): Result<T> {
	return { ok: true, value };
}

export function failed<T>(issues: InputIssue[]): Result<T> {
	return { ok: false, issues };
}

/** What each input is called on the page, so a message never shows an internal name. */
const FIELD_WORDS: Record<string, string> = {
	bits: 'Resolution (bits)',
	capacitanceF: 'Capacitance',
	clockHz: 'Clock',
	coilOhm: 'Coil resistance',
	coilV: 'Coil voltage',
	colour: 'Colour',
	contactRatingA: 'Contact current rating',
	contactRatingV: 'Contact voltage rating',
	continuousDrainA: 'Switch drain rating',
	currentA: 'Current',
	dielectricEpsR: 'Dielectric constant',
	drainCurrentA: 'Drain current',
	finalV: 'Final voltage',
	forwardRangeV: 'Forward-voltage spread',
	forwardV: 'Forward voltage',
	gapM: 'Gap',
	gateThresholdMaxV: 'Gate threshold (max)',
	handEpsR: 'Hand dielectric constant',
	handFraction: 'Hand fills',
	ledsInSeries: 'LEDs in series',
	loadCurrentA: 'Load current',
	loadSupply: 'Load supply',
	loadV: 'Load voltage',
	logicHighV: 'Logic high',
	maxPowerW: 'Power rating',
	maxStepPercent: 'Largest step',
	maxTop: 'Largest timer top',
	minOffS: 'Minimum off time',
	minOnS: 'Minimum on time',
	mode: 'Mode',
	offS: 'Gap between pulses',
	ohms: 'Resistance',
	onS: 'Pulse on time',
	pinLimitA: 'Pin current limit',
	prescaler: 'Prescaler',
	rdsOnDriveV: 'Gate drive for on-resistance',
	rdsOnOhm: 'On-resistance',
	readingNoiseCounts: 'Noise per reading',
	referenceV: 'Comparator reference',
	resistanceOhm: 'Resistor',
	sampleOverheadS: 'Time between readings',
	samplesAveraged: 'Readings averaged',
	series: 'Series',
	startV: 'Starting voltage',
	strayCapacitanceF: 'Stray capacitance',
	strings: 'Strings in parallel',
	supplyV: 'Supply voltage',
	switchDropV: 'Switch drop',
	targetHz: 'Target frequency',
	targetV: 'Target voltage',
	timeS: 'Time',
	timerBits: 'Timer bits',
	timerClockHz: 'Timer clock',
	top: 'Timer top'
};

/** The words for an input: from the table, else its name split into words. */
export function fieldWords(field: string): string {
	const known = FIELD_WORDS[field];
	if (known) return known;
	const words = field.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
	return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Collects input issues so a form can show every problem at once rather than the first. */
export class InputChecker {
	readonly issues: InputIssue[] = [];

	private isNumber(field: string, value: unknown): value is number {
		if (typeof value !== 'number' || !Number.isFinite(value)) {
			this.issues.push({ field, message: `${fieldWords(field)} must be a number.` });
			return false;
		}
		return true;
	}

	finite(field: string, value: unknown): void {
		this.isNumber(field, value);
	}

	positive(field: string, value: unknown): void {
		if (this.isNumber(field, value) && value <= 0) {
			this.issues.push({ field, message: `${fieldWords(field)} must be above zero.` });
		}
	}

	nonNegative(field: string, value: unknown): void {
		if (this.isNumber(field, value) && value < 0) {
			this.issues.push({ field, message: `${fieldWords(field)} cannot be below zero.` });
		}
	}

	atLeast(field: string, value: unknown, min: number): void {
		if (this.isNumber(field, value) && value < min) {
			this.issues.push({ field, message: `${fieldWords(field)} must be at least ${fmt(min)}.` });
		}
	}

	between(field: string, value: unknown, min: number, max: number): void {
		if (this.isNumber(field, value) && (value < min || value > max)) {
			this.issues.push({
				field,
				message: `${fieldWords(field)} must be from ${fmt(min)} to ${fmt(max)}.`
			});
		}
	}

	integer(field: string, value: unknown, min: number, max = Number.MAX_SAFE_INTEGER): void {
		if (!this.isNumber(field, value)) return;
		if (!Number.isInteger(value) || value < min || value > max) {
			const range =
				max === Number.MAX_SAFE_INTEGER ? `${fmt(min)} or more` : `${fmt(min)} to ${fmt(max)}`;
			this.issues.push({
				field,
				message: `${fieldWords(field)} must be a whole number, ${range}.`
			});
		}
	}

	add(field: string, message: string): void {
		this.issues.push({ field, message });
	}

	get clean(): boolean {
		return this.issues.length === 0;
	}
}

/** Guards against results that overflow double range from extreme but individually valid inputs. */
export function allFinite(values: number[]): boolean {
	return values.every((v) => Number.isFinite(v));
}

/** Four significant figures for messages, without exponent noise for ordinary sizes. */
export function fmt(value: number): string {
	return String(Number(value.toPrecision(4)));
}
