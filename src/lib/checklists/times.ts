// When a result happened, as far as anyone can tell: the phone's clock, checked against the server's.

/** How far ahead of the server a phone's clock may run before it is not believed. */
export const CLOCK_AHEAD_MS = 2 * 60_000; // common practice, no published source
/** How long a result may wait on a phone before its time is not believed. */
export const CLOCK_MAX_WAIT_MS = 24 * 3_600_000;
/** A result received this long after it was recorded counts as sent late. */
export const LATE_AFTER_MS = 2 * 60_000; // common practice, no published source

/**
 * Judge the time a phone says a result was recorded, against the time the server received it.
 * No time from the phone: the received time. A time in the future (beyond a small skew) or more
 * than a day before receipt is kept as the phone said but marked suspect.
 */
export function judgeRecordedAt(
	phone: Date | null,
	received: Date
): { recordedAt: Date; clockSuspect: boolean } {
	if (!phone || Number.isNaN(phone.getTime())) return { recordedAt: received, clockSuspect: false };
	const ahead = phone.getTime() - received.getTime();
	const suspect = ahead > CLOCK_AHEAD_MS || -ahead > CLOCK_MAX_WAIT_MS;
	return { recordedAt: phone, clockSuspect: suspect };
}

export interface TimedResult {
	recordedAt: string;
	receivedAt: string;
	clockSuspect: boolean;
}

/** The time a result is ordered by: what the phone said, unless its clock looked wrong. */
export function orderTime(r: TimedResult): number {
	return Date.parse(r.clockSuspect ? r.receivedAt : r.recordedAt);
}

/** Newest first, by order time; ties by received time. */
export function newestFirst<T extends TimedResult>(list: T[]): T[] {
	return [...list].sort(
		(a, b) => orderTime(b) - orderTime(a) || Date.parse(b.receivedAt) - Date.parse(a.receivedAt)
	);
}

/** Sent well after it was recorded (it waited on the phone). */
export function arrivedLate(r: TimedResult): boolean {
	return !r.clockSuspect && Date.parse(r.receivedAt) - Date.parse(r.recordedAt) > LATE_AFTER_MS;
}
