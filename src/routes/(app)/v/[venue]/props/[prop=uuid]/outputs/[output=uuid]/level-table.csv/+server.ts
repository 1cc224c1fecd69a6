import { levelTableToCsv } from '$lib/curves';
import { requireRole } from '$lib/server/auth/guard';
import { levelTableDownload } from '../download';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	requireRole(event);
	const { table, slug } = await levelTableDownload(event);
	return new Response(levelTableToCsv(table), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${slug}-levels.csv"`
		}
	});
};
