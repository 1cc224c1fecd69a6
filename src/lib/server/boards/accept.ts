import type { Db } from '$lib/server/db/client';
import { MAX_BODY_BYTES, parseReadings } from '$lib/boards/wire';
import { keyForToken } from './keys';
import { takeReadings } from './limits';
import { storeReadings } from './ingest';

// One message from a board, by either way in: checked, limited and stored, or refused with a
// reason in plain words. Never throws for anything a board can send.

export type Accepted =
	| { ok: true; stored: number; duplicates: number }
	| { ok: false; status: 400 | 401 | 403 | 413 | 422 | 429; message: string; retryAfter?: number };

export async function acceptMessage(
	db: Db,
	{
		token,
		text,
		contentType = '',
		controllerId,
		now = new Date()
	}: {
		/** The key from the Authorization header; over MQTT it is inside the message. */
		token: string | null;
		text: string;
		contentType?: string;
		/** Over MQTT, the controller named in the topic, which must be the key's own. */
		controllerId?: string;
		now?: Date;
	}
): Promise<Accepted> {
	if (Buffer.byteLength(text) > MAX_BODY_BYTES)
		return {
			ok: false,
			status: 413,
			message: `A message may be at most ${MAX_BODY_BYTES / 1024} KB; send fewer readings at a time.`
		};
	const parsed = parseReadings(text, contentType);
	const given = token ?? parsed.key ?? null;
	if (!given) return { ok: false, status: 401, message: 'This needs a board key.' };
	const key = await keyForToken(db, given, now);
	if (!key)
		return {
			ok: false,
			status: 401,
			message:
				'That board key is not known or has been revoked: make a new one on the controllers page.'
		};
	if (controllerId !== undefined && controllerId !== key.controllerId)
		return {
			ok: false,
			status: 403,
			message: 'That key belongs to another controller: publish to its own topic.'
		};
	if (!parsed.ok) return { ok: false, status: 400, message: parsed.message };
	const allowed = takeReadings(key.id, parsed.readings.length, now.getTime());
	if (!allowed.ok)
		return {
			ok: false,
			status: 429,
			message: `This key is sending readings faster than allowed; wait ${allowed.retryAfter} s.`,
			retryAfter: allowed.retryAfter
		};
	const stored = await storeReadings(db, key, parsed.readings, now);
	return stored;
}
