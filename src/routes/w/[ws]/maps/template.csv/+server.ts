import { signalTableTemplate } from '$lib/can/signal-table-csv';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	await requireRole(event, 'viewer');
	return new Response(signalTableTemplate(), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="framewright-signal-table-template.csv"'
		}
	});
};
