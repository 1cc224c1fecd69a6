import { COMMON_PRACTICE, InputChecker, failed, fmt, ok, type Check, type Result } from './result';

export type RelayLoadKind =
	'pneumatic-valve' | 'solenoid' | 'motor' | 'fog' | 'audio-trigger' | 'strobe' | 'lamp' | 'other';

/** Loads with a coil or winding, which kick back when switched off. */
export const INDUCTIVE_LOADS: readonly RelayLoadKind[] = ['pneumatic-valve', 'solenoid', 'motor'];

/** Extra-low voltage limits (IEC 61140): above these a load counts as hazardous voltage. */
export const EXTRA_LOW_VOLTAGE = { ac: 50, dc: 120 } as const;

export type PulseInput = {
	/** Requested on time, s. */
	onS: number;
	/** The part's minimum on time to act fully (valve shift, solenoid pull-in), s. */
	minOnS: number;
	/** Requested off time before the next pulse, s. */
	offS?: number;
	/** The part's minimum off time to reset (exhaust, spring return), s. */
	minOffS?: number;
};

/** Checks a requested pulse against the part's minimum on and off times. */
export function checkPulse(input: PulseInput): Result<Check[]> {
	const check = new InputChecker();
	check.positive('onS', input.onS);
	check.nonNegative('minOnS', input.minOnS);
	if (input.offS !== undefined) check.positive('offS', input.offS);
	if (input.minOffS !== undefined) check.nonNegative('minOffS', input.minOffS);
	if (!check.clean) return failed(check.issues);

	const checks: Check[] = [];
	if (input.onS < input.minOnS) {
		checks.push({
			level: 'fail',
			code: 'pulse-too-short',
			message:
				`A ${fmt(input.onS * 1000)} ms pulse is shorter than the part's ` +
				`${fmt(input.minOnS * 1000)} ms minimum on time; it may not move fully.`,
			basis: 'datasheet minimum on time'
		});
	}
	if (input.offS !== undefined && input.minOffS !== undefined && input.offS < input.minOffS) {
		checks.push({
			level: 'fail',
			code: 'gap-too-short',
			message:
				`A ${fmt(input.offS * 1000)} ms gap is shorter than the part's ` +
				`${fmt(input.minOffS * 1000)} ms minimum off time; it may not reset between pulses.`,
			basis: 'datasheet minimum off time'
		});
	}
	return ok(checks);
}

export type RelayInput = {
	/** Coil voltage, V. */
	coilV: number;
	/** Coil resistance, ohm. */
	coilOhm: number;
	/** Most current the controller pin may source or sink, A. */
	pinLimitA: number;
	loadKind: RelayLoadKind;
	/** Overrides whether the load is treated as inductive. */
	loadInductive?: boolean;
	/** Whether the switched load runs on AC or DC. */
	loadSupply: 'ac' | 'dc';
	/** Load voltage, V. */
	loadV: number;
	/** Load current, A. */
	loadCurrentA: number;
	/** Contact current rating for this kind of supply, A. */
	contactRatingA: number;
	/** Contact voltage rating for this kind of supply, V. */
	contactRatingV: number;
	/** Requested on and off times with the load's minimums, when the load is pulsed. */
	pulse?: PulseInput;
};

export type RelayCheck = {
	/** Vcoil/Rcoil, A. */
	coilCurrentA: number;
	/** True when the coil draws more than the pin may supply. */
	driverNeeded: boolean;
	loadInductive: boolean;
	/** True when no check failed. */
	passes: boolean;
	checks: Check[];
};

export function checkRelay(input: RelayInput): Result<RelayCheck> {
	const check = new InputChecker();
	check.positive('coilV', input.coilV);
	check.positive('coilOhm', input.coilOhm);
	check.positive('pinLimitA', input.pinLimitA);
	check.positive('loadV', input.loadV);
	check.nonNegative('loadCurrentA', input.loadCurrentA);
	check.positive('contactRatingA', input.contactRatingA);
	check.positive('contactRatingV', input.contactRatingV);
	if (input.loadSupply !== 'ac' && input.loadSupply !== 'dc') {
		check.add('loadSupply', 'loadSupply must be ac or dc');
	}
	const pulse = input.pulse ? checkPulse(input.pulse) : null;
	if (pulse && !pulse.ok) {
		for (const issue of pulse.issues) check.add(`pulse.${issue.field}`, issue.message);
	}
	if (!check.clean) return failed(check.issues);

	const coilCurrentA = input.coilV / input.coilOhm;
	const driverNeeded = coilCurrentA > input.pinLimitA;
	const loadInductive = input.loadInductive ?? INDUCTIVE_LOADS.includes(input.loadKind);
	const checks: Check[] = [];

	if (driverNeeded) {
		checks.push({
			level: 'fail',
			code: 'driver-needed',
			message:
				`The coil draws ${fmt(coilCurrentA * 1000)} mA, above the ${fmt(input.pinLimitA * 1000)} mA ` +
				'pin limit. Drive it through a transistor or driver, not straight from the pin.',
			basis: "Ohm's law and the controller's pin rating"
		});
	}
	checks.push({
		level: 'info',
		code: 'flyback-coil',
		message:
			'Fit a flyback diode across the relay coil (cathode to the positive side) so the switch-off ' +
			'spike cannot reach the driver or the controller.',
		basis: COMMON_PRACTICE
	});
	if (loadInductive) {
		checks.push({
			level: 'info',
			code: input.loadSupply === 'dc' ? 'flyback-load' : 'snubber-load',
			message:
				input.loadSupply === 'dc'
					? 'The load is a coil too: fit a flyback diode across it to protect the contacts.'
					: 'The load is a coil on AC: fit a snubber or varistor across it to protect the contacts.',
			basis: COMMON_PRACTICE
		});
	}
	if (input.loadCurrentA > input.contactRatingA) {
		checks.push({
			level: 'fail',
			code: 'contact-current',
			message:
				`The load draws ${fmt(input.loadCurrentA)} A, above the contacts' ` +
				`${fmt(input.contactRatingA)} A ${input.loadSupply.toUpperCase()} rating.`,
			basis: 'datasheet contact rating'
		});
	} else if (loadInductive || input.loadKind === 'lamp') {
		checks.push({
			level: 'warning',
			code: 'contact-derating',
			message:
				'Contact ratings are usually quoted for resistive loads; coils, motors and lamps draw ' +
				'more at switching. Check the datasheet for an inductive or lamp rating.',
			basis: COMMON_PRACTICE
		});
	}
	if (input.loadV > input.contactRatingV) {
		checks.push({
			level: 'fail',
			code: 'contact-voltage',
			message:
				`The load runs at ${fmt(input.loadV)} V, above the contacts' ` +
				`${fmt(input.contactRatingV)} V ${input.loadSupply.toUpperCase()} rating.`,
			basis: 'datasheet contact rating'
		});
	}
	if (input.loadV > EXTRA_LOW_VOLTAGE[input.loadSupply]) {
		checks.push({
			level: 'warning',
			code: 'hazardous-voltage',
			message:
				'The load is above extra-low voltage. Mains wiring must follow local codes and the ' +
				'authority having jurisdiction; have a licensed electrician do it.',
			basis: 'IEC 61140 extra-low voltage limits'
		});
	}
	if (pulse?.ok) checks.push(...pulse.value);

	return ok({
		coilCurrentA,
		driverNeeded,
		loadInductive,
		passes: !checks.some((c) => c.level === 'fail'),
		checks
	});
}
