// Per-key rate limit on readings, a token bucket in this process's memory: each key may send
// RATE readings a second on average, and up to BURST at once (a board catching up after a gap).
// With several app servers each keeps its own buckets, so the venue-wide limit is that many times
// higher; the limit is there to stop a runaway board, not to meter.

export const RATE_PER_SECOND = 100;
export const BURST = 2000;

const buckets = new Map<string, { tokens: number; at: number }>();

/** Takes n readings from the key's bucket; the seconds to wait when there are not enough. */
export function takeReadings(
	keyId: string,
	n: number,
	now = Date.now()
): { ok: true } | { ok: false; retryAfter: number } {
	const b = buckets.get(keyId) ?? { tokens: BURST, at: now };
	b.tokens = Math.min(BURST, b.tokens + ((now - b.at) / 1000) * RATE_PER_SECOND);
	b.at = now;
	buckets.set(keyId, b);
	if (b.tokens < n) return { ok: false, retryAfter: Math.ceil((n - b.tokens) / RATE_PER_SECOND) };
	b.tokens -= n;
	if (buckets.size > 10_000) buckets.delete(buckets.keys().next().value!);
	return { ok: true };
}

/** For tests. */
export function resetLimits() {
	buckets.clear();
}
