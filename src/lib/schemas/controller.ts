import { z } from 'zod';
import { num, optNum, text } from './num';

/** Blank means none: the board spends no time there. */
const timeOrNone = (label: string, scale: number, max: number) =>
	optNum(label, { kind: 'seconds', scale, min: 0, max }).transform((v) => v ?? 0);

export const controllerSchema = z
	.object({
		name: text('A name'),
		supplyV: num('Supply voltage', { kind: 'volts', gt: 0, max: 60 }),
		clockHz: num('Clock', { kind: 'hertz', gt: 0, max: 1e9 }),
		timerBits: num('Timer bits', { int: true, min: 8, max: 32 }),
		pwmBits: num('PWM bits', { int: true, min: 8, max: 16 }),
		prescaler: num('Prescaler', { int: true, min: 1, max: 65536 }),
		referenceV: num('Comparator reference', { kind: 'volts', gt: 0, max: 60 }),
		pinLimitMa: num('Pin current limit', { kind: 'amps', scale: 1e-3, gt: 0, max: 1000 }),
		supplyRatingA: num('Supply rating', { kind: 'amps', gt: 0, max: 1000 }),
		rechargeUs: timeOrNone('Recharge time', 1e-6, 1e6),
		loopOverheadMs: timeOrNone('Loop overhead', 1e-3, 10_000)
	})
	.refine((c) => c.referenceV < c.supplyV, {
		message: 'The comparator reference must be below the supply voltage.',
		path: ['referenceV']
	});
export type ControllerInput = z.infer<typeof controllerSchema>;
