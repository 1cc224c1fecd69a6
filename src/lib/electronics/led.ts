import { chooseSeries, nextAtOrAbove, type ESeries } from './eseries';
import {
	COMMON_PRACTICE,
	InputChecker,
	allFinite,
	failed,
	fmt,
	ok,
	type Check,
	type Result
} from './result';

export type LedColour =
	'red' | 'orange' | 'amber' | 'yellow-green' | 'green' | 'blue' | 'white' | 'infrared';

export type ForwardVoltage = { label: string; typicalV: number; minV: number; maxV: number };

/** Current at which the forward voltages below are quoted, and the usual maximum for small LEDs. */
export const LED_TEST_CURRENT_A = 0.02;

/** Typical forward voltage at 20 mA: the middle of the charted range (white: of its common band). */
export const LED_COLOURS: Readonly<Record<LedColour, ForwardVoltage>> = {
	red: { label: 'Red', typicalV: 2.0, minV: 1.8, maxV: 2.2 },
	orange: { label: 'Orange', typicalV: 2.05, minV: 2.0, maxV: 2.1 },
	amber: { label: 'Amber / yellow', typicalV: 2.1, minV: 2.0, maxV: 2.2 },
	'yellow-green': { label: 'Yellow-green', typicalV: 2.2, minV: 2.0, maxV: 2.4 },
	green: { label: 'Green', typicalV: 3.15, minV: 2.8, maxV: 3.5 },
	blue: { label: 'Blue', typicalV: 3.3, minV: 3.0, maxV: 3.6 },
	white: { label: 'White', typicalV: 3.2, minV: 2.8, maxV: 3.6 },
	infrared: { label: 'Infrared', typicalV: 1.4, minV: 1.2, maxV: 1.6 }
};

/** Resistor power ratings commonly stocked, W. */
export const RESISTOR_POWER_RATINGS_W: readonly number[] = [0.125, 0.25, 0.5, 1, 2, 3, 5];

/** A resistor is bought rated at least this many times its dissipation. */
export const RESISTOR_POWER_MARGIN = 2;

/** The smallest stocked rating at or above twice the dissipation, or null when none is. */
export function resistorRating(dissipationW: number): number | null {
	// The slack keeps floating-point noise (1 W computed as 1.0000000000000002) off the next rating.
	const needed = dissipationW * RESISTOR_POWER_MARGIN * (1 - 1e-9);
	return RESISTOR_POWER_RATINGS_W.find((w) => w >= needed) ?? null;
}

export type LedStringInput = {
	/** Supply voltage across the string, resistor and switch, V. */
	supplyV: number;
	/** Sets the forward voltage and its range from the colour table. */
	colour?: LedColour;
	/** Forward voltage per LED, V; overrides the colour's typical value. */
	forwardV?: number;
	/** Spread of forward voltage to check; the colour's range by default. */
	forwardRangeV?: { minV: number; maxV: number };
	/** LEDs in series per string; 1 by default. */
	ledsInSeries?: number;
	/** Target current per string, A. */
	currentA: number;
	/** Voltage across the switching transistor when on, V; 0 by default. */
	switchDropV?: number;
	/** Identical strings in parallel, each with its own resistor; 1 by default. */
	strings?: number;
	/** Series to snap the resistor to; chosen by chooseSeries() by default. */
	series?: ESeries;
};

export type LedString = {
	forwardV: number;
	/** Supply minus LEDs minus switch, V. */
	headroomV: number;
	/** (Vs - n*Vf - Vswitch)/I before snapping, ohm. */
	exactOhms: number;
	series: ESeries;
	/** Why this series, and why rounded up. */
	seriesReason: string;
	/** The series value at or above exactOhms, ohm. */
	resistorOhms: number;
	/** Current per string with the snapped resistor, A. */
	currentA: number;
	/** I^2*R per resistor, W, with the chosen (series) value. */
	resistorPowerW: number;
	/** Headroom^2/R per resistor, W, with the exact value: what the target current would dissipate. */
	exactResistorPowerW: number;
	/** Rating to buy: at least twice the dissipation, W; null above the largest stocked rating. */
	resistorRatingW: number | null;
	/** Vf*I per LED, W. */
	ledPowerW: number;
	strings: number;
	/** All strings together, A. */
	totalCurrentA: number;
	/** Drawn from the supply by all strings, W. */
	totalPowerW: number;
	/** Current per string across the forward-voltage spread; null when no spread is known. */
	currentRangeA: { atMinForwardV: number; atMaxForwardV: number } | null;
	checks: Check[];
};

export function ledString(input: LedStringInput): Result<LedString> {
	const colour = input.colour ? LED_COLOURS[input.colour] : undefined;
	const forwardV = input.forwardV ?? colour?.typicalV;
	// A typed forward voltage moves the colour's spread with it, in proportion: a 2.9 V red LED
	// is not checked against the 1.8-2.2 V of a typical red one.
	const scale = colour && input.forwardV !== undefined ? input.forwardV / colour.typicalV : 1;
	const range =
		input.forwardRangeV ??
		(colour ? { minV: colour.minV * scale, maxV: colour.maxV * scale } : null);
	const n = input.ledsInSeries ?? 1;
	const switchDropV = input.switchDropV ?? 0;
	const strings = input.strings ?? 1;

	const check = new InputChecker();
	if (input.colour !== undefined && !colour) {
		check.add('colour', `colour must be one of ${Object.keys(LED_COLOURS).join(', ')}`);
	}
	check.positive('supplyV', input.supplyV);
	if (forwardV === undefined) check.add('forwardV', 'give a forward voltage or an LED colour');
	else check.positive('forwardV', forwardV);
	if (range) {
		check.positive('forwardRangeV.minV', range.minV);
		check.positive('forwardRangeV.maxV', range.maxV);
		if (range.minV > range.maxV) check.add('forwardRangeV', 'minV must not exceed maxV');
	}
	check.integer('ledsInSeries', n, 1);
	check.positive('currentA', input.currentA);
	check.nonNegative('switchDropV', switchDropV);
	check.integer('strings', strings, 1);
	if (!check.clean || forwardV === undefined) return failed(check.issues);

	const dropV = n * forwardV + switchDropV;
	const headroomV = input.supplyV - dropV;
	if (headroomV <= 0) {
		return failed([
			{
				field: 'supplyV',
				message:
					`No headroom: ${n} × ${fmt(forwardV)} V` +
					(switchDropV > 0 ? ` + ${fmt(switchDropV)} V switch` : '') +
					` = ${fmt(dropV)} V, which is not below the ${fmt(input.supplyV)} V supply. ` +
					'Put fewer LEDs in each string or raise the supply.'
			}
		]);
	}

	const choice = input.series ? null : chooseSeries();
	const series = input.series ?? (choice?.ok ? choice.value.series : 'E24');
	const exactOhms = headroomV / input.currentA;
	const snapped = nextAtOrAbove(exactOhms, series);
	if (!snapped.ok) return failed([{ field: 'currentA', message: 'resistor value out of range' }]);
	const resistorOhms = snapped.value;
	const why = choice?.ok ? choice.value.reason : `${series} as chosen.`;
	const seriesReason = `${why} Rounded up, never down, so the current stays at or below target.`;

	const currentA = headroomV / resistorOhms;
	const resistorPowerW = currentA ** 2 * resistorOhms;
	const totalCurrentA = currentA * strings;
	const currentAt = (vf: number) =>
		Math.max(0, (input.supplyV - n * vf - switchDropV) / resistorOhms);
	const currentRangeA = range
		? { atMinForwardV: currentAt(range.minV), atMaxForwardV: currentAt(range.maxV) }
		: null;
	if (!allFinite([exactOhms, currentA, resistorPowerW, totalCurrentA])) {
		return failed([{ field: 'currentA', message: 'result out of range; check the units' }]);
	}

	const resistorRatingW = resistorRating(resistorPowerW);
	const checks: Check[] = [];
	if (resistorRatingW === null) {
		checks.push({
			level: 'fail',
			code: 'resistor-power',
			message:
				`The resistor dissipates ${fmt(resistorPowerW)} W, more than half of the largest common ` +
				'rating (5 W). Put more LEDs in each string, lower the supply, or use a constant-current driver.',
			basis: COMMON_PRACTICE
		});
	}
	if (currentA > LED_TEST_CURRENT_A) {
		checks.push({
			level: 'warning',
			code: 'led-current',
			message:
				`${fmt(currentA * 1000)} mA is above 20 mA, the usual maximum for small indicator LEDs; ` +
				"check the LED's datasheet.",
			basis: 'LED reference charts'
		});
	}
	if (range && input.supplyV - n * range.maxV - switchDropV <= 0) {
		checks.push({
			level: 'warning',
			code: 'forward-voltage-spread',
			message:
				`LEDs at the top of the forward-voltage range (${fmt(range.maxV)} V) leave no headroom ` +
				'and may stay dark or dim. Put fewer LEDs in each string.',
			basis: 'LED reference charts'
		});
	}

	return ok({
		forwardV,
		headroomV,
		exactOhms,
		series,
		seriesReason,
		resistorOhms,
		currentA,
		resistorPowerW,
		exactResistorPowerW: headroomV ** 2 / exactOhms,
		resistorRatingW,
		ledPowerW: forwardV * currentA,
		strings,
		totalCurrentA,
		totalPowerW: input.supplyV * totalCurrentA,
		currentRangeA,
		checks
	});
}

/** A logic-level MOSFET (or similar) switching the low side of a load. */
export type SwitchCheckInput = {
	/** Controller output high voltage driving the gate, V. */
	logicHighV: number;
	/** Datasheet VGS(th) maximum, V. */
	gateThresholdMaxV: number;
	/** Gate voltage at which the datasheet quotes RDS(on), V. */
	rdsOnDriveV?: number;
	/** Datasheet RDS(on), ohm. */
	rdsOnOhm?: number;
	/** Load current through the switch, A. */
	drainCurrentA: number;
	/** Datasheet continuous drain current, A. */
	continuousDrainA: number;
	/** Datasheet power dissipation limit, W. */
	maxPowerW?: number;
};

export type SwitchCheck = {
	/** True when no check failed. */
	passes: boolean;
	/** I*RDS(on), V; a lower bound when the gate is driven below the RDS(on) test voltage. */
	dropV: number | null;
	/** I^2*RDS(on), W; likewise a lower bound. */
	dissipationW: number | null;
	checks: Check[];
};

/** Gate drive below this multiple of VGS(th) max may leave the switch partly on. */
export const GATE_DRIVE_MARGIN = 2;

export function checkSwitch(input: SwitchCheckInput): Result<SwitchCheck> {
	const check = new InputChecker();
	check.positive('logicHighV', input.logicHighV);
	check.positive('gateThresholdMaxV', input.gateThresholdMaxV);
	if (input.rdsOnDriveV !== undefined) check.positive('rdsOnDriveV', input.rdsOnDriveV);
	if (input.rdsOnOhm !== undefined) check.nonNegative('rdsOnOhm', input.rdsOnOhm);
	check.nonNegative('drainCurrentA', input.drainCurrentA);
	check.positive('continuousDrainA', input.continuousDrainA);
	if (input.maxPowerW !== undefined) check.positive('maxPowerW', input.maxPowerW);
	if (!check.clean) return failed(check.issues);

	const { logicHighV: vg, gateThresholdMaxV: vth } = input;
	const checks: Check[] = [];
	if (vg <= vth) {
		checks.push({
			level: 'fail',
			code: 'gate-below-threshold',
			message:
				`A ${fmt(vg)} V logic high does not exceed the ${fmt(vth)} V maximum gate threshold; ` +
				'some parts will not turn on at all. Use a logic-level part or a gate driver.',
			basis: 'datasheet VGS(th)'
		});
	} else if (vg < GATE_DRIVE_MARGIN * vth) {
		checks.push({
			level: 'warning',
			code: 'gate-drive-low',
			message:
				`A ${fmt(vg)} V logic high is under twice the ${fmt(vth)} V maximum gate threshold, so ` +
				'the switch may be only partly on and run hot. Use a logic-level part or a gate driver.',
			basis: COMMON_PRACTICE
		});
	}
	const belowRdsDrive = input.rdsOnDriveV !== undefined && vg < input.rdsOnDriveV;
	if (belowRdsDrive) {
		checks.push({
			level: 'warning',
			code: 'gate-below-rds-drive',
			message:
				`RDS(on) is quoted at ${fmt(input.rdsOnDriveV!)} V gate drive; at ${fmt(vg)} V it is ` +
				'higher and not guaranteed. Pick a part rated at your logic level.',
			basis: 'datasheet RDS(on) test condition'
		});
	}
	if (input.drainCurrentA > input.continuousDrainA) {
		checks.push({
			level: 'fail',
			code: 'drain-over-rating',
			message:
				`${fmt(input.drainCurrentA * 1000)} mA is above the ${fmt(input.continuousDrainA * 1000)} mA ` +
				'continuous drain rating.',
			basis: 'datasheet ID'
		});
	}
	const dropV = input.rdsOnOhm === undefined ? null : input.drainCurrentA * input.rdsOnOhm;
	const dissipationW = dropV === null ? null : dropV * input.drainCurrentA;
	if (dissipationW !== null && input.maxPowerW !== undefined && dissipationW > input.maxPowerW) {
		checks.push({
			level: 'fail',
			code: 'switch-power',
			message:
				`The switch dissipates ${fmt(dissipationW)} W` +
				(belowRdsDrive ? ' or more' : '') +
				`, above its ${fmt(input.maxPowerW)} W limit.`,
			basis: 'datasheet PD'
		});
	}
	return ok({
		passes: !checks.some((c) => c.level === 'fail'),
		dropV,
		dissipationW,
		checks
	});
}
