import { describe, expect, it } from 'vitest';
import { controllerSchema } from './controller';

const board = {
	name: 'Well board',
	supplyV: '5',
	clockHz: '16M',
	timerBits: '16',
	pwmBits: '8',
	prescaler: '64',
	referenceV: '1.1',
	pinLimitMa: '20',
	supplyRatingA: '2'
};

describe('controllerSchema timing fields', () => {
	it('reads the recharge time in µs and the loop overhead in ms, in SI notation too', () => {
		// SI prefixes (BIPM SI Brochure, 9th edition, table 7): 0.01 ms = 10 µs; 1500 µs = 1.5 ms
		const r = controllerSchema.safeParse({
			...board,
			rechargeUs: '0.01 ms',
			loopOverheadMs: '1500 µs'
		});
		expect(r.success && [r.data.rechargeUs, r.data.loopOverheadMs]).toEqual([10, 1.5]);
	});

	it('takes a blank as none, never as an old value', () => {
		const r = controllerSchema.safeParse({ ...board, rechargeUs: '', loopOverheadMs: '  ' });
		expect(r.success && [r.data.rechargeUs, r.data.loopOverheadMs]).toEqual([0, 0]);
	});

	it('refuses a negative time with the range, in words', () => {
		const r = controllerSchema.safeParse({ ...board, rechargeUs: '-5', loopOverheadMs: '' });
		expect(r.success).toBe(false);
		const message = r.error!.issues.find((i) => i.path[0] === 'rechargeUs')!.message;
		expect(message).toMatch(/^Recharge time must be from 0/);
	});
});
