import {
	buildLevelTable,
	checkFlicker,
	curveProblems,
	reviewLevelTable,
	type BrightnessCurve
} from '$lib/curves';
import { pwmFrequencyForBits } from '$lib/electronics';

/** Without a controller, the level table uses 8-bit PWM and skips the flicker check. */
export const FALLBACK_PWM_BITS = 8;

export type PwmController = { clockHz: number; prescaler: number; pwmBits: number } | null;

/** The level table of an LED output at its controller's PWM bits, reviewed and flicker-checked. */
export function levelTableFor(curve: BrightnessCurve, controller: PwmController) {
	const problems = curveProblems(curve);
	if (problems.length) return { ok: false as const, problems };
	const bits = controller?.pwmBits ?? FALLBACK_PWM_BITS;
	const table = buildLevelTable(curve, { bits });
	const review = reviewLevelTable(table);
	const freq = controller
		? pwmFrequencyForBits({ clockHz: controller.clockHz, prescaler: controller.prescaler, bits })
		: null;
	const pwmHz = freq?.ok ? freq.value : null;
	return {
		ok: true as const,
		table,
		review,
		pwmHz,
		flicker: pwmHz === null ? null : checkFlicker(pwmHz)
	};
}
