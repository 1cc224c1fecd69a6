import { levelTableToC } from '$lib/curves';
import { requireRole } from '$lib/server/auth/guard';
import { levelTableDownload } from '../download';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	requireRole(event);
	const { table, name, slug } = await levelTableDownload(event);
	return new Response(levelTableToC(table, name), {
		headers: {
			'content-type': 'text/x-c; charset=utf-8',
			'content-disposition': `attachment; filename="${slug}-levels.h"`
		}
	});
};
