import { z } from 'zod';
import { num, optText } from './num';
import { WEAR_KINDS } from '../wear/counters';

/** Guest count at close: guests, and the groups either as guests per group or as a number. */
export const guestCountSchema = z
	.object({
		guests: num('Guests', { int: true, min: 0, max: 1_000_000 }),
		groupsBy: z.enum(['size', 'count'], { error: 'Say how the groups are given.' }),
		groupValue: num('That figure', { int: true, min: 1, max: 1_000_000 })
	})
	.superRefine((v, ctx) => {
		if (v.groupsBy === 'count' && v.groupValue > Math.max(v.guests, 1))
			ctx.addIssue({
				code: 'custom',
				path: ['groupValue'],
				message: 'There cannot be more groups than guests.'
			});
	});

export const wearSettingSchema = z
	.object({
		kind: z.enum(WEAR_KINDS, { error: 'Choose what wears out.' }),
		ratedLife: num('Rated life', { gt: 0, max: 1e12 }),
		interval: num('Maintenance interval', { gt: 0, max: 1e12 })
	})
	.superRefine((v, ctx) => {
		if (v.interval > v.ratedLife)
			ctx.addIssue({
				code: 'custom',
				path: ['interval'],
				message: 'The maintenance interval cannot be longer than the rated life.'
			});
	});

export const maintenanceSchema = z.object({
	note: z
		.string({ error: 'Say what was done.' })
		.trim()
		.min(1, 'Say what was done.')
		.max(1000, 'Use at most 1000 characters.')
});

export const closeTickSchema = z.object({
	line: z.string().max(100),
	outcome: z.enum(['pass', 'fail'], { error: 'Choose done or not done.' }),
	note: optText(1000)
});

export const closeSignSchema = z.object({ note: optText(1000) });
