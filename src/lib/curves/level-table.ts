import { curveFunction, type BrightnessCurve } from './curve';
import { lightnessOfDuty } from './lightness';

export const MIN_PWM_BITS = 8;
export const MAX_PWM_BITS = 16;
export const DEFAULT_LEVELS = 256;

/**
 * A lightness jump above which a fade visibly steps. About 1 L* is the usual figure for a
 * difference just seen between patches side by side; a fade is seen one level after another,
 * where small steps are harder to catch, so 2 L* flags the steps people actually notice.
 * Common practice, no published source.
 */
export const VISIBLE_STEP_LIGHTNESS = 2;

export interface LevelTable {
	curve: BrightnessCurve;
	bits: number;
	levels: number;
	/** 2^bits - 1, the count for full duty. */
	maxCount: number;
	/** One duty count per input level, 0..maxCount, never decreasing. */
	counts: number[];
}

export interface LevelTableOptions {
	bits: number;
	levels?: number;
}

export function levelTableProblems(options: LevelTableOptions): string[] {
	const problems: string[] = [];
	const { bits, levels = DEFAULT_LEVELS } = options;
	if (!Number.isInteger(bits) || bits < MIN_PWM_BITS || bits > MAX_PWM_BITS)
		problems.push(
			`PWM bits ${bits} must be a whole number from ${MIN_PWM_BITS} to ${MAX_PWM_BITS}`
		);
	if (!Number.isInteger(levels) || levels < 2 || levels > 65536)
		problems.push(`levels ${levels} must be a whole number from 2 to 65536`);
	return problems;
}

/** Input level i of n is i/(n-1); its count is the curve's duty times 2^bits - 1, rounded. */
export function buildLevelTable(curve: BrightnessCurve, options: LevelTableOptions): LevelTable {
	const problems = levelTableProblems(options);
	if (problems.length > 0) throw new RangeError(problems.join('; '));
	const { bits, levels = DEFAULT_LEVELS } = options;
	const duty = curveFunction(curve);
	const maxCount = 2 ** bits - 1;
	const counts: number[] = new Array(levels);
	let previous = 0;
	for (let i = 0; i < levels; i++) {
		// Running maximum guards against a last-bit wobble in floating point breaking monotony.
		previous = Math.max(previous, Math.round(duty(i / (levels - 1)) * maxCount));
		counts[i] = previous;
	}
	return { curve, bits, levels, maxCount, counts };
}

export interface CoarseStep {
	/** Input level index of the upper entry of the pair. */
	index: number;
	fromCount: number;
	toCount: number;
	/** Difference in CIE L* between the two entries. */
	lightnessStep: number;
}

export interface CollapsedRun {
	fromIndex: number;
	toIndex: number;
	count: number;
}

export interface LevelTableWarning {
	code: 'first-step' | 'coarse-steps' | 'dark-levels-off' | 'collapsed-levels';
	message: string;
}

export interface LevelTableReview {
	threshold: number;
	/** Pairs of adjacent lit entries whose lightness differs by more than the threshold. */
	coarseSteps: CoarseStep[];
	/** Runs of two or more adjacent input levels that give the same count. */
	collapsed: CollapsedRun[];
	firstLitIndex: number | null;
	/** L* of the lowest lit entry: the jump from off to the first light. */
	firstLitLightness: number | null;
	warnings: LevelTableWarning[];
}

function round1(value: number): number {
	return Math.round(value * 10) / 10;
}

export function reviewLevelTable(
	table: LevelTable,
	threshold = VISIBLE_STEP_LIGHTNESS
): LevelTableReview {
	const { counts, maxCount } = table;
	const last = counts.length - 1;
	const coarseSteps: CoarseStep[] = [];
	const collapsed: CollapsedRun[] = [];
	let runStart = 0;
	for (let i = 1; i <= counts.length; i++) {
		if (i < counts.length && counts[i] === counts[runStart]) continue;
		if (i - 1 > runStart)
			collapsed.push({ fromIndex: runStart, toIndex: i - 1, count: counts[runStart] });
		runStart = i;
	}
	for (let i = 1; i < counts.length; i++) {
		if (counts[i - 1] === 0 || counts[i] === counts[i - 1]) continue;
		const step = lightnessOfDuty(counts[i] / maxCount) - lightnessOfDuty(counts[i - 1] / maxCount);
		if (step > threshold)
			coarseSteps.push({
				index: i,
				fromCount: counts[i - 1],
				toCount: counts[i],
				lightnessStep: step
			});
	}
	const firstLit = counts.findIndex((c) => c > 0);
	const firstLitIndex = firstLit === -1 ? null : firstLit;
	const firstLitLightness =
		firstLitIndex === null ? null : lightnessOfDuty(counts[firstLitIndex] / maxCount);

	const warnings: LevelTableWarning[] = [];
	if (firstLitLightness !== null && firstLitLightness > threshold)
		warnings.push({
			code: 'first-step',
			message: `the light comes on at L* ${round1(firstLitLightness)} at level ${firstLitIndex} of ${last}, a visible jump from off`
		});
	if (coarseSteps.length > 0) {
		const largest = coarseSteps.reduce((a, b) => (b.lightnessStep > a.lightnessStep ? b : a));
		warnings.push({
			code: 'coarse-steps',
			message:
				`${coarseSteps.length} step${coarseSteps.length === 1 ? '' : 's'} between lit levels jump by more than ${threshold} L* ` +
				`(largest ${round1(largest.lightnessStep)} L* at level ${largest.index} of ${last}); ` +
				'more PWM bits smooth the dark end'
		});
	}
	const off = collapsed.find((run) => run.fromIndex === 0 && run.count === 0);
	if (off && off.toIndex < last)
		warnings.push({
			code: 'dark-levels-off',
			message: `levels 0 to ${off.toIndex} all give count 0, so the light stays off until level ${off.toIndex + 1}`
		});
	const lit = collapsed.filter((run) => run.count > 0);
	if (lit.length > 0) {
		const levelsLost = lit.reduce((sum, run) => sum + run.toIndex - run.fromIndex, 0);
		warnings.push({
			code: 'collapsed-levels',
			message: `${levelsLost} input level${levelsLost === 1 ? '' : 's'} repeat the count before them (first at level ${lit[0].fromIndex + 1}), so the fade pauses there`
		});
	}
	return { threshold, coarseSteps, collapsed, firstLitIndex, firstLitLightness, warnings };
}
