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

/** Collects input issues so a form can show every problem at once rather than the first. */
export class InputChecker {
	readonly issues: InputIssue[] = [];

	private isNumber(field: string, value: unknown): value is number {
		if (typeof value !== 'number' || !Number.isFinite(value)) {
			this.issues.push({ field, message: `${field} must be a finite number` });
			return false;
		}
		return true;
	}

	finite(field: string, value: unknown): void {
		this.isNumber(field, value);
	}

	positive(field: string, value: unknown): void {
		if (this.isNumber(field, value) && value <= 0) {
			this.issues.push({ field, message: `${field} must be greater than zero` });
		}
	}

	nonNegative(field: string, value: unknown): void {
		if (this.isNumber(field, value) && value < 0) {
			this.issues.push({ field, message: `${field} must not be negative` });
		}
	}

	atLeast(field: string, value: unknown, min: number): void {
		if (this.isNumber(field, value) && value < min) {
			this.issues.push({ field, message: `${field} must be at least ${min}` });
		}
	}

	between(field: string, value: unknown, min: number, max: number): void {
		if (this.isNumber(field, value) && (value < min || value > max)) {
			this.issues.push({ field, message: `${field} must be between ${min} and ${max}` });
		}
	}

	integer(field: string, value: unknown, min: number, max = Number.MAX_SAFE_INTEGER): void {
		if (!this.isNumber(field, value)) return;
		if (!Number.isInteger(value) || value < min || value > max) {
			const range = max === Number.MAX_SAFE_INTEGER ? `${min} or more` : `${min} to ${max}`;
			this.issues.push({ field, message: `${field} must be a whole number, ${range}` });
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
