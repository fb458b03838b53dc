import { requireRole } from '$lib/server/guard';
import type { LayoutServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return { workspace, role };
}) satisfies LayoutServerLoad;
