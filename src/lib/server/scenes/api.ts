import { json, type RequestEvent } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { loadScene } from './model';

const isUuid = (s: string | undefined) => !!s && /^[0-9a-f-]{36}$/i.test(s);

/** The scene named in an API route, or a 404 response. */
export async function apiScene(event: Pick<RequestEvent, 'params'>, venueId: string) {
	const id = event.params.scene;
	const loaded = isUuid(id) ? await loadScene(db, venueId, id!) : null;
	if (!loaded)
		return {
			ok: false as const,
			response: json({ message: 'There is no such scene.' }, { status: 404 })
		};
	return { ok: true as const, loaded };
}

export const nameTakenResponse = () =>
	json(
		{
			message: 'Some fields need fixing.',
			errors: { name: ['A scene of this venue already has that name.'] }
		},
		{ status: 400 }
	);

export const refErrorResponse = (errors: Record<string, string[]>) =>
	json({ message: 'Some fields need fixing.', errors }, { status: 400 });
