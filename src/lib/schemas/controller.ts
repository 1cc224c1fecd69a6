import { z } from 'zod';
import { num, text } from './num';

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
		supplyRatingA: num('Supply rating', { kind: 'amps', gt: 0, max: 1000 })
	})
	.refine((c) => c.referenceV < c.supplyV, {
		message: 'The comparator reference must be below the supply voltage.',
		path: ['referenceV']
	});
export type ControllerInput = z.infer<typeof controllerSchema>;
