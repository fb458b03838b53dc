import { listWorkspacesForUser } from '$lib/server/workspaces/workspaces';
import type { LayoutServerLoad } from './$types';

export const load = (async ({ locals }) => {
	const { db, config } = locals.services;
	const user = locals.user;
	return {
		user,
		workspaces: user ? await listWorkspacesForUser(db, user.id) : [],
		demoMode: config.demoMode
	};
}) satisfies LayoutServerLoad;
