import { InputChecker, failed, ok, type Result } from './result';

/** Fast mode counts up to TOP and wraps; phase-correct counts up to TOP and back down. */
export type PwmMode = 'fast' | 'phase-correct';

export type PwmTopInput = {
	/** Timer input clock before the prescaler, Hz. */
	clockHz: number;
	/** Prescaler (divider); 1 by default. */
	prescaler?: number;
	/** Value the counter counts up to. */
	top: number;
	/** 'fast' by default. */
	mode?: PwmMode;
};

export type PwmBitsInput = Omit<PwmTopInput, 'top'> & {
	/** Counter width; TOP = 2^bits - 1. */
	bits: number;
};

function checkClock(check: InputChecker, clockHz: number, prescaler: number, mode: PwmMode): void {
	check.positive('clockHz', clockHz);
	check.integer('prescaler', prescaler, 1);
	if (mode !== 'fast' && mode !== 'phase-correct') {
		check.add('mode', 'mode must be fast or phase-correct');
	}
}

function frequency(clockHz: number, prescaler: number, top: number, mode: PwmMode): number {
	return mode === 'fast' ? clockHz / (prescaler * (1 + top)) : clockHz / (2 * prescaler * top);
}

/** PWM frequency for a TOP value: f_clk/(N*(1+TOP)) fast, f_clk/(2*N*TOP) phase-correct, Hz. */
export function pwmFrequency(input: PwmTopInput): Result<number> {
	const prescaler = input.prescaler ?? 1;
	const mode = input.mode ?? 'fast';
	const check = new InputChecker();
	checkClock(check, input.clockHz, prescaler, mode);
	check.integer('top', input.top, 1);
	if (!check.clean) return failed(check.issues);
	return ok(frequency(input.clockHz, prescaler, input.top, mode));
}

/** PWM frequency for a full counter: f_clk/(N*2^bits) fast, f_clk/(N*(2*2^bits - 2)) phase-correct, Hz. */
export function pwmFrequencyForBits(input: PwmBitsInput): Result<number> {
	const check = new InputChecker();
	check.integer('bits', input.bits, 1, 32);
	if (!check.clean) return failed(check.issues);
	return pwmFrequency({ ...input, top: 2 ** input.bits - 1 });
}

export type PwmSetting = {
	top: number;
	/** Frequency actually reached with the whole-number TOP, Hz. */
	frequencyHz: number;
	/** log2(TOP + 1): the duty resolution, bits (fractional when TOP + 1 is not a power of two). */
	resolutionBits: number;
};

/** The whole-number TOP giving the frequency closest to targetHz, within the counter's range. */
export function topForFrequency(
	input: Omit<PwmTopInput, 'top'> & { targetHz: number; maxTop?: number }
): Result<PwmSetting> {
	const prescaler = input.prescaler ?? 1;
	const mode = input.mode ?? 'fast';
	const maxTop = input.maxTop ?? 65535;
	const check = new InputChecker();
	checkClock(check, input.clockHz, prescaler, mode);
	check.positive('targetHz', input.targetHz);
	check.integer('maxTop', maxTop, 1);
	if (!check.clean) return failed(check.issues);

	const ticks = input.clockHz / (prescaler * input.targetHz);
	const ideal = mode === 'fast' ? ticks - 1 : ticks / 2;
	const candidates = [Math.floor(ideal), Math.ceil(ideal)].filter((t) => t >= 1 && t <= maxTop);
	if (candidates.length === 0) {
		return failed([
			{
				field: 'targetHz',
				message:
					ideal < 1
						? 'targetHz is too high for this clock and prescaler'
						: 'targetHz is too low for this clock and prescaler; raise the prescaler'
			}
		]);
	}
	const error = (t: number) =>
		Math.abs(frequency(input.clockHz, prescaler, t, mode) - input.targetHz);
	const top = candidates.reduce((best, t) => (error(t) < error(best) ? t : best));
	return ok({
		top,
		frequencyHz: frequency(input.clockHz, prescaler, top, mode),
		resolutionBits: Math.log2(top + 1)
	});
}
