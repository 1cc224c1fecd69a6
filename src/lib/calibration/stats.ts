export const DEFAULT_SAMPLE_SIZE = 4096;

/** Small seeded generator so the kept sample, and so the histogram, repeats run to run. */
function seededRandom(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

export interface ReadingSummary {
	count: number;
	mean: number;
	/** Sample standard deviation (n - 1); 0 with fewer than two readings. */
	sigma: number;
	min: number;
	max: number;
	/** An evenly drawn sample of at most sampleSize readings, for histograms. */
	sample: number[];
}

export interface ReadingStatsOptions {
	sampleSize?: number;
	seed?: number;
}

/**
 * Running statistics of one stream of readings in bounded memory: count, mean and sigma by
 * Welford's update, exact min and max, and a uniform random sample of fixed size (reservoir
 * sampling, algorithm R) from which a histogram of any range can be drawn afterwards.
 */
export class ReadingStats {
	count = 0;
	mean = 0;
	min = Infinity;
	max = -Infinity;
	private m2 = 0;
	private readonly sample: number[] = [];
	private readonly sampleSize: number;
	private readonly random: () => number;

	constructor(options: ReadingStatsOptions = {}) {
		this.sampleSize = options.sampleSize ?? DEFAULT_SAMPLE_SIZE;
		this.random = seededRandom(options.seed ?? 1);
	}

	add(value: number): void {
		this.count++;
		const delta = value - this.mean;
		this.mean += delta / this.count;
		this.m2 += delta * (value - this.mean);
		if (value < this.min) this.min = value;
		if (value > this.max) this.max = value;
		if (this.sample.length < this.sampleSize) this.sample.push(value);
		else {
			const j = Math.floor(this.random() * this.count);
			if (j < this.sampleSize) this.sample[j] = value;
		}
	}

	get variance(): number {
		return this.count > 1 ? this.m2 / (this.count - 1) : 0;
	}

	get sigma(): number {
		return Math.sqrt(this.variance);
	}

	summary(): ReadingSummary {
		return {
			count: this.count,
			mean: this.count > 0 ? this.mean : NaN,
			sigma: this.sigma,
			min: this.count > 0 ? this.min : NaN,
			max: this.count > 0 ? this.max : NaN,
			sample: [...this.sample]
		};
	}
}

/**
 * Least-squares straight line y = intercept + slope * x, built one point at a time, with the
 * slope's standard error (NIST/SEMATECH e-Handbook 4.4.4: s^2 = SSE / (n - 2), SE = s / sqrt Sxx).
 */
export class LineFit {
	count = 0;
	private meanX = 0;
	private meanY = 0;
	private sxx = 0;
	private sxy = 0;
	private syy = 0;

	add(x: number, y: number): void {
		this.count++;
		const dx = x - this.meanX;
		const dy = y - this.meanY;
		this.meanX += dx / this.count;
		this.meanY += dy / this.count;
		this.sxx += dx * (x - this.meanX);
		this.sxy += dx * (y - this.meanY);
		this.syy += dy * (y - this.meanY);
	}

	/** Degrees of freedom left for the residuals: n - 2. */
	get residualDf(): number {
		return Math.max(0, this.count - 2);
	}

	/** NaN until three points with two different x values have been seen. */
	get slopeStandardError(): number {
		if (this.count < 3 || !(this.sxx > 0)) return NaN;
		const sse = Math.max(0, this.syy - (this.sxy * this.sxy) / this.sxx);
		return Math.sqrt(sse / (this.count - 2) / this.sxx);
	}

	/** NaN until two different x values have been seen. */
	get slope(): number {
		return this.count > 1 && this.sxx > 0 ? this.sxy / this.sxx : NaN;
	}

	get intercept(): number {
		return this.meanY - this.slope * this.meanX;
	}
}

export type CaptureLabel = 'idle' | 'present';

export interface CaptureRow {
	/** Seconds, when the capture has a time column. */
	time?: number;
	reading: number;
	label: CaptureLabel;
}

export interface CaptureSummary {
	rows: number;
	idle: ReadingSummary;
	present: ReadingSummary;
	/** True when every row carried a time. */
	timed: boolean;
	/** Rows per second over the capture's time span, when timed. */
	measuredRateHz: number | null;
	/** The measured rate when the capture has times, else the rate given by the caller. */
	updateRateHz: number | null;
	/** Slope of idle readings over time, per minute; null without times or an update rate. */
	driftPerMinute: number | null;
	/** Standard error of that slope, per minute; null when drift is. */
	driftStandardErrorPerMinute: number | null;
	/** Degrees of freedom of the drift fit (idle rows - 2); null when drift is null. */
	driftDegreesOfFreedom: number | null;
}

export interface CaptureStatsOptions extends ReadingStatsOptions {
	/** Readings per second, used to place rows in time when the capture has no time column. */
	updateRateHz?: number;
}

/**
 * Statistics of a labelled capture in bounded memory. Drift is fitted on idle rows only, against
 * their time, or against row number divided by the update rate when there is no time column.
 */
export class CaptureStats {
	rows = 0;
	readonly idle: ReadingStats;
	readonly present: ReadingStats;
	private readonly overTime = new LineFit();
	private readonly overRow = new LineFit();
	private untimed = 0;
	private firstTime = Infinity;
	private lastTime = -Infinity;
	private readonly updateRateHz: number | undefined;

	constructor(options: CaptureStatsOptions = {}) {
		const { updateRateHz, sampleSize, seed = 1 } = options;
		if (updateRateHz !== undefined && !(updateRateHz > 0 && Number.isFinite(updateRateHz)))
			throw new RangeError(`update rate ${updateRateHz} Hz must be above 0`);
		this.updateRateHz = updateRateHz;
		this.idle = new ReadingStats({ sampleSize, seed });
		this.present = new ReadingStats({ sampleSize, seed: seed + 1 });
	}

	add(row: CaptureRow): void {
		const index = this.rows++;
		if (row.time === undefined) this.untimed++;
		else {
			if (row.time < this.firstTime) this.firstTime = row.time;
			if (row.time > this.lastTime) this.lastTime = row.time;
		}
		if (row.label === 'present') {
			this.present.add(row.reading);
			return;
		}
		this.idle.add(row.reading);
		this.overRow.add(index, row.reading);
		if (row.time !== undefined) this.overTime.add(row.time, row.reading);
	}

	summary(): CaptureSummary {
		const timed = this.rows > 0 && this.untimed === 0;
		const span = this.lastTime - this.firstTime;
		const measuredRateHz = timed && this.rows > 1 && span > 0 ? (this.rows - 1) / span : null;
		// Times in the file say how fast the board really read; the caller's estimate is for files without.
		const updateRateHz = timed ? measuredRateHz : (this.updateRateHz ?? null);
		let slopePerSecond = NaN;
		let errorPerSecond = NaN;
		let fit: LineFit | null = null;
		if (timed) {
			fit = this.overTime;
			slopePerSecond = fit.slope;
			errorPerSecond = fit.slopeStandardError;
		} else if (this.updateRateHz !== undefined) {
			fit = this.overRow;
			slopePerSecond = fit.slope * this.updateRateHz;
			errorPerSecond = fit.slopeStandardError * this.updateRateHz;
		}
		const drift = Number.isFinite(slopePerSecond);
		return {
			rows: this.rows,
			idle: this.idle.summary(),
			present: this.present.summary(),
			timed,
			measuredRateHz,
			updateRateHz,
			driftPerMinute: drift ? slopePerSecond * 60 : null,
			driftStandardErrorPerMinute:
				drift && Number.isFinite(errorPerSecond) ? errorPerSecond * 60 : null,
			driftDegreesOfFreedom: drift && fit ? fit.residualDf : null
		};
	}
}

export interface Histogram {
	/** bins + 1 edges from min to max. */
	edges: number[];
	/** Estimated readings per bin in the whole stream (sample counts scaled up). */
	counts: number[];
}

/**
 * Fixed-bin histogram of a sample, scaled to the number of readings it stands for. The last bin
 * includes its upper edge; values outside min..max are left out.
 */
export function histogram(
	sample: number[],
	options: { min: number; max: number; bins: number; total?: number }
): Histogram {
	const { min, max, bins } = options;
	if (!Number.isInteger(bins) || bins < 1)
		throw new RangeError(`bins ${bins} must be a whole number above 0`);
	if (!(max > min)) throw new RangeError('histogram range needs max above min');
	const width = (max - min) / bins;
	const edges = Array.from({ length: bins + 1 }, (_, i) => (i === bins ? max : min + i * width));
	const counts: number[] = new Array(bins).fill(0);
	for (const value of sample) {
		if (value < min || value > max) continue;
		counts[Math.min(bins - 1, Math.floor((value - min) / width))]++;
	}
	const scale = sample.length > 0 ? (options.total ?? sample.length) / sample.length : 0;
	return { edges, counts: counts.map((c) => c * scale) };
}

/** Histograms of both labels over one shared range, for a chart with threshold lines. */
export function captureHistograms(
	summary: Pick<CaptureSummary, 'idle' | 'present'>,
	bins = 40
): { idle: Histogram; present: Histogram } | null {
	const { idle, present } = summary;
	const min = Math.min(idle.count ? idle.min : Infinity, present.count ? present.min : Infinity);
	const max = Math.max(idle.count ? idle.max : -Infinity, present.count ? present.max : -Infinity);
	if (!Number.isFinite(min) || !Number.isFinite(max)) return null;
	const range = max > min ? { min, max } : { min: min - 0.5, max: max + 0.5 };
	return {
		idle: histogram(idle.sample, { ...range, bins, total: idle.count }),
		present: histogram(present.sample, { ...range, bins, total: present.count })
	};
}
