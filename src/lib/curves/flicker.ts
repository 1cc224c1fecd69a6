/** Percent flicker as IEEE 1789-2015 defines modulation: 100 * (Lmax - Lmin) / (Lmax + Lmin). */
export function modulationPercent(lightMax: number, lightMin: number): number {
	if (!(lightMax >= lightMin) || lightMin < 0)
		throw new RangeError('light levels must satisfy 0 <= minimum <= maximum');
	const sum = lightMax + lightMin;
	return sum === 0 ? 0 : (100 * (lightMax - lightMin)) / sum;
}

/** On/off PWM swings from dark to full, 100 % modulation, except at duty 0 or full where it is steady. */
export function pwmModulationPercent(duty: number): number {
	return duty > 0 && duty < 1 ? 100 : 0;
}

export type FlickerRisk = 'low-risk' | 'not-low-risk';

export interface FlickerCheck {
	frequencyHz: number;
	modulationPercent: number;
	/** Highest modulation counted as low risk at this frequency; null when any is. */
	limitPercent: number | null;
	risk: FlickerRisk;
}

/**
 * IEEE 1789-2015 low-risk region: modulation below 0.025 * f under 90 Hz, below 0.08 * f from 90
 * to 1250 Hz, and any modulation above 1250 Hz.
 */
export function checkFlicker(frequencyHz: number, modulation = 100): FlickerCheck {
	if (!Number.isFinite(frequencyHz) || frequencyHz <= 0)
		throw new RangeError(`frequency ${frequencyHz} Hz must be above 0`);
	if (!Number.isFinite(modulation) || modulation < 0 || modulation > 100)
		throw new RangeError(`modulation ${modulation} % must be in 0..100`);
	const limitPercent =
		frequencyHz > 1250 ? null : frequencyHz < 90 ? 0.025 * frequencyHz : 0.08 * frequencyHz;
	const low = limitPercent === null || modulation < limitPercent;
	return {
		frequencyHz,
		modulationPercent: modulation,
		limitPercent,
		risk: low ? 'low-risk' : 'not-low-risk'
	};
}
