import { json } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { MAX_BODY_BYTES } from '$lib/boards/wire';
import { acceptMessage } from '$lib/server/boards/accept';
import type { RequestHandler } from './$types';

// Readings from boards that speak HTTP: `Authorization: Bearer <board key>`, a body in the wire
// format (src/lib/boards/wire.ts): JSON, or text lines `sensor seq reading [label]`.

/** The body as text, or null when it is longer than the limit (read no further than that). */
async function readLimited(request: Request): Promise<string | null> {
	const declared = Number(request.headers.get('content-length') ?? 0);
	if (declared > MAX_BODY_BYTES) return null;
	if (!request.body) return '';
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > MAX_BODY_BYTES) {
			await reader.cancel().catch(() => {});
			return null;
		}
		chunks.push(value);
	}
	return new TextDecoder('utf-8', { fatal: false }).decode(Buffer.concat(chunks));
}

// Public: a board has no session; the board key in the Authorization header is the permission,
// checked by acceptMessage before anything is read or stored.
export const POST: RequestHandler = async ({ request }) => {
	const auth = request.headers.get('authorization') ?? '';
	const token = /^Bearer\s+(\S+)$/i.exec(auth)?.[1] ?? null;
	if (!token)
		return json(
			{ message: 'This needs a board key: send it as “Authorization: Bearer <key>”.' },
			{ status: 401 }
		);
	let text: string | null;
	try {
		text = await readLimited(request);
	} catch {
		return json({ message: 'The message could not be read; send it again.' }, { status: 400 });
	}
	if (text === null)
		return json(
			{
				message: `A message may be at most ${MAX_BODY_BYTES / 1024} KB; send fewer readings at a time.`
			},
			{ status: 413 }
		);
	const result = await acceptMessage(db, {
		token,
		text,
		contentType: request.headers.get('content-type') ?? ''
	});
	if (!result.ok)
		return json(
			{ message: result.message },
			{
				status: result.status,
				headers: result.retryAfter ? { 'retry-after': String(result.retryAfter) } : {}
			}
		);
	return json({ stored: result.stored, duplicates: result.duplicates });
};
