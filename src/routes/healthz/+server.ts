import { json } from '@sveltejs/kit';
import { checkHealth } from '$lib/server/health';
import type { RequestHandler } from './$types';

/** Database reachable and storage writable: 200 `{ status: "ok", … }`, else 503 naming the part. */
export const GET: RequestHandler = async ({ locals }) => {
	const health = await checkHealth(locals.services);
	return json(health, {
		status: health.status === 'ok' ? 200 : 503,
		headers: { 'cache-control': 'no-store' }
	});
};
