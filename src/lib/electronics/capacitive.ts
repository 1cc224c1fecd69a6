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

/** Vacuum permittivity, F/m (CODATA 2018). */
export const EPS0 = 8.8541878128e-12;
/** Relative permittivity of dry air at 20 °C. */
export const EPS_R_AIR = 1.000536;
/** Relative permittivity of water at 20 °C, used for a hand. */
export const EPS_R_WATER = 80;

export const cm2ToM2 = (cm2: number): number => cm2 / 1e4;
export const mmToM = (mm: number): number => mm / 1e3;
export const pfToF = (pf: number): number => pf * 1e-12;
export const fToPf = (f: number): number => f * 1e12;

export type RcTimeInput = {
	resistanceOhm: number;
	capacitanceF: number;
	/** Voltage on the capacitor at t = 0, V. */
	startV: number;
	/** Voltage the capacitor is heading toward, V; 0 for a discharge to ground. */
	finalV?: number;
	/** Voltage whose crossing time is wanted, V; strictly between start and final. */
	targetV: number;
};

/** Time for an RC node to move from startV to targetV: RC*ln((V0 - Vx)/(Vth - Vx)), seconds. */
export function rcTime(input: RcTimeInput): Result<number> {
	const { resistanceOhm, capacitanceF, startV, targetV } = input;
	const finalV = input.finalV ?? 0;
	const check = new InputChecker();
	check.positive('resistanceOhm', resistanceOhm);
	check.positive('capacitanceF', capacitanceF);
	check.finite('startV', startV);
	check.finite('targetV', targetV);
	check.finite('finalV', finalV);
	if (!check.clean) return failed(check.issues);
	const ratio = (startV - finalV) / (targetV - finalV);
	if (!(ratio > 1 && Number.isFinite(ratio))) {
		return failed([
			{ field: 'targetV', message: 'targetV must lie strictly between startV and finalV' }
		]);
	}
	const t = resistanceOhm * capacitanceF * Math.log(ratio);
	return Number.isFinite(t)
		? ok(t)
		: failed([{ field: 'capacitanceF', message: 'result out of range' }]);
}

/** Voltage on an RC node after `timeS`: Vx + (V0 - Vx)*e^(-t/RC). */
export function rcVoltage(input: Omit<RcTimeInput, 'targetV'> & { timeS: number }): Result<number> {
	const check = new InputChecker();
	check.positive('resistanceOhm', input.resistanceOhm);
	check.positive('capacitanceF', input.capacitanceF);
	check.nonNegative('timeS', input.timeS);
	check.finite('startV', input.startV);
	check.finite('finalV', input.finalV ?? 0);
	if (!check.clean) return failed(check.issues);
	const finalV = input.finalV ?? 0;
	const tau = input.resistanceOhm * input.capacitanceF;
	return ok(finalV + (input.startV - finalV) * Math.exp(-input.timeS / tau));
}

/** A capacitive plate read by timing its RC discharge from the supply down to a comparator reference. */
export type CapacitivePlateInput = {
	/** Discharge resistor, ohm. */
	resistanceOhm: number;
	/** Plate area, m^2 (use cm2ToM2 for cm^2). */
	plateAreaM2: number;
	/** Gap between the plate and the hand or body it senses, m (use mmToM for mm). */
	gapM: number;
	/** Relative permittivity of what fills the gap when idle; dry air by default. */
	dielectricEpsR?: number;
	/** Wiring and pin capacitance in parallel with the plate, F; 0 by default. */
	strayCapacitanceF?: number;
	/** Voltage the plate is charged to before each reading, V. */
	supplyV: number;
	/** Comparator reference the discharge is timed down to, V. */
	referenceV: number;
	/** Timer input clock before the prescaler, Hz. */
	timerClockHz: number;
	/** Timer prescaler (divider); 1 by default. */
	prescaler?: number;
	/** Timer counter width, bits. */
	timerBits: number;
	/** Readings averaged into one update; 1 by default. */
	samplesAveraged?: number;
	/** Noise of a single reading, counts (standard deviation); 0 by default. */
	readingNoiseCounts?: number;
	/** Time the firmware spends recharging the plate before each reading, s; 0 by default. */
	rechargeTimeS?: number;
	/** Other time per reading besides the discharge (code between readings), s; 0 by default. */
	sampleOverheadS?: number;
	/** Time once per update besides the readings (the rest of the board's loop), s; 0 by default. */
	loopOverheadS?: number;
	/** Fraction of the gap a hand fills for the estimate, 0..1; 0.5 by default. */
	handFraction?: number;
	/** Relative permittivity of the hand layer; water-like 80 by default. */
	handEpsR?: number;
};

export type HandEstimate = {
	/** Always true: a model, to be replaced by a capture. */
	estimate: true;
	handFraction: number;
	capacitanceF: number;
	dischargeTimeS: number;
	counts: number;
	/** Counts above the idle reading. */
	changeCounts: number;
	/** changeCounts divided by the noise of the mean. */
	changeInNoise: number;
	overflow: boolean;
};

export type CapacitivePlateReading = {
	/** eps0*epsr*A/d, F. */
	plateCapacitanceF: number;
	/** Plate plus stray, F. */
	capacitanceF: number;
	/** R*C*ln(V0/Vref), s. */
	dischargeTimeS: number;
	/** Expected timer counts for one reading (fractional; the timer shows the whole part). */
	counts: number;
	/** Counts added by each extra pF. */
	countsPerPf: number;
	/** 2^bits: a reading at or above this wraps the counter. */
	timerRangeCounts: number;
	overflow: boolean;
	/** Updates per second: 1 / (N (recharge + discharge + per-reading overhead) + loop overhead). */
	updateRateHz: number;
	/** Standard deviation of the averaged reading, counts. */
	noiseCounts: number;
	hand: HandEstimate;
	checks: Check[];
};

/** Below about this many idle counts a reading is too coarse to see a hand well (common practice). */
export const COARSE_COUNTS = 50;

// Quantisation of a uniform step of one count has standard deviation 1/sqrt(12).
const QUANTISATION_VARIANCE = 1 / 12;

export function capacitivePlate(input: CapacitivePlateInput): Result<CapacitivePlateReading> {
	const epsR = input.dielectricEpsR ?? EPS_R_AIR;
	const stray = input.strayCapacitanceF ?? 0;
	const prescaler = input.prescaler ?? 1;
	const n = input.samplesAveraged ?? 1;
	const sigma = input.readingNoiseCounts ?? 0;
	const overhead = input.sampleOverheadS ?? 0;
	const recharge = input.rechargeTimeS ?? 0;
	const loop = input.loopOverheadS ?? 0;
	const handFraction = input.handFraction ?? 0.5;
	const handEpsR = input.handEpsR ?? EPS_R_WATER;

	const check = new InputChecker();
	check.positive('resistanceOhm', input.resistanceOhm);
	check.positive('plateAreaM2', input.plateAreaM2);
	check.positive('gapM', input.gapM);
	check.atLeast('dielectricEpsR', epsR, 1);
	check.nonNegative('strayCapacitanceF', stray);
	check.positive('supplyV', input.supplyV);
	check.positive('referenceV', input.referenceV);
	check.positive('timerClockHz', input.timerClockHz);
	check.integer('prescaler', prescaler, 1);
	check.integer('timerBits', input.timerBits, 1, 32);
	check.integer('samplesAveraged', n, 1);
	check.nonNegative('readingNoiseCounts', sigma);
	check.nonNegative('sampleOverheadS', overhead);
	check.nonNegative('rechargeTimeS', recharge);
	check.nonNegative('loopOverheadS', loop);
	check.between('handFraction', handFraction, 0, 1);
	check.atLeast('handEpsR', handEpsR, 1);
	if (check.clean && input.referenceV >= input.supplyV) {
		check.add('referenceV', 'referenceV must be below supplyV, or the discharge never crosses it');
	}
	if (!check.clean) return failed(check.issues);

	const { resistanceOhm: r, plateAreaM2: area, gapM: gap, timerClockHz: clock } = input;
	const logRatio = Math.log(input.supplyV / input.referenceV);
	const secondsToCounts = clock / prescaler;
	const timerRange = 2 ** input.timerBits;

	const plateC = (EPS0 * epsR * area) / gap;
	const c = plateC + stray;
	const t = r * c * logRatio;
	const counts = t * secondsToCounts;
	const countsPerPf = r * logRatio * secondsToCounts * 1e-12;
	const updateRateHz = 1 / (n * (recharge + t + overhead) + loop);
	const noiseCounts = Math.sqrt(sigma ** 2 + QUANTISATION_VARIANCE) / Math.sqrt(n);

	// Series layers: air over (1 - f) of the gap, hand over f of it.
	const airLayer = ((1 - handFraction) * gap) / epsR;
	const handLayer = (handFraction * gap) / handEpsR;
	const handC = (EPS0 * area) / (airLayer + handLayer) + stray;
	const handT = r * handC * logRatio;
	const handCounts = handT * secondsToCounts;

	if (!allFinite([plateC, c, t, counts, countsPerPf, updateRateHz, handC, handCounts])) {
		return failed([{ field: 'plateAreaM2', message: 'result out of range; check the units' }]);
	}

	const overflow = counts >= timerRange;
	const handOverflow = handCounts >= timerRange;
	const checks: Check[] = [];
	if (overflow) {
		checks.push({
			level: 'warning',
			code: 'timer-overflow',
			message:
				`An idle reading of ${fmt(counts)} counts overflows the ${input.timerBits}-bit timer ` +
				`(${timerRange}); raise the prescaler or lower R.`,
			basis: 'timer range 2^bits'
		});
	} else if (handOverflow) {
		checks.push({
			level: 'warning',
			code: 'timer-overflow-hand',
			message:
				`With a hand in the gap the reading (${fmt(handCounts)} counts, estimate) would overflow ` +
				`the ${input.timerBits}-bit timer (${timerRange}); raise the prescaler or lower R.`,
			basis: 'timer range 2^bits'
		});
	}
	if (counts < 1) {
		checks.push({
			level: 'warning',
			code: 'below-one-count',
			message: `The discharge lasts ${fmt(counts)} timer counts; raise R or the timer clock.`,
			basis: 'timer resolution'
		});
	} else if (counts < COARSE_COUNTS) {
		checks.push({
			level: 'warning',
			code: 'coarse-resolution',
			message:
				`An idle reading of about ${fmt(counts)} counts is coarse: one count is ` +
				`${Number((100 / counts).toPrecision(2))} % of it, so a hand may move it by only a count or two. ` +
				'Raise R or the timer clock, or lower the prescaler.',
			basis: COMMON_PRACTICE
		});
	}

	return ok({
		plateCapacitanceF: plateC,
		capacitanceF: c,
		dischargeTimeS: t,
		counts,
		countsPerPf,
		timerRangeCounts: timerRange,
		overflow,
		updateRateHz,
		noiseCounts,
		hand: {
			estimate: true,
			handFraction,
			capacitanceF: handC,
			dischargeTimeS: handT,
			counts: handCounts,
			changeCounts: handCounts - counts,
			changeInNoise: (handCounts - counts) / noiseCounts,
			overflow: handOverflow
		},
		checks
	});
}

/** A plate's settings as a prop form keeps them (cm², mm, pF). */
export type PlateSettings = {
	resistanceOhm: number;
	plateAreaCm2: number;
	gapMm: number;
	strayPf: number;
	samplesAveraged: number;
	readingNoiseCounts?: number | null;
	handFraction?: number | null;
};

/** The controller fields the plate maths reads; times in the units its form keeps (µs, ms). */
export type PlateController = {
	supplyV: number;
	referenceV: number;
	clockHz: number;
	prescaler: number;
	timerBits: number;
	rechargeUs?: number | null;
	loopOverheadMs?: number | null;
};

/** The plate maths for a sensor's settings on its controller. */
export function plateOnController(
	s: PlateSettings,
	c: PlateController
): Result<CapacitivePlateReading> {
	return capacitivePlate({
		resistanceOhm: s.resistanceOhm,
		plateAreaM2: cm2ToM2(s.plateAreaCm2),
		gapM: mmToM(s.gapMm),
		strayCapacitanceF: pfToF(s.strayPf),
		supplyV: c.supplyV,
		referenceV: c.referenceV,
		timerClockHz: c.clockHz,
		prescaler: c.prescaler,
		timerBits: c.timerBits,
		samplesAveraged: s.samplesAveraged,
		readingNoiseCounts: s.readingNoiseCounts ?? undefined,
		handFraction: s.handFraction ?? undefined,
		rechargeTimeS: (c.rechargeUs ?? 0) * 1e-6,
		loopOverheadS: (c.loopOverheadMs ?? 0) * 1e-3
	});
}
