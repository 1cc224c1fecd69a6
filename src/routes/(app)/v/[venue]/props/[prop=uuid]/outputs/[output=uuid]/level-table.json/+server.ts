import { levelTableToJson } from '$lib/curves';
import { requireRole } from '$lib/server/auth/guard';
import { levelTableDownload } from '../download';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	requireRole(event);
	const { table, name, slug } = await levelTableDownload(event);
	return new Response(levelTableToJson(table, name), {
		headers: {
			'content-type': 'application/json',
			'content-disposition': `attachment; filename="${slug}-levels.json"`
		}
	});
};
