import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import type { SessionUser, WorkspaceAccess } from './access';
import { findWorkspaceBySlug } from './workspaces/workspaces';
import { findMembership } from './workspaces/members';
import { Problem } from './problem';
import { roleAtLeast, type Role } from '../roles';

export type { SessionUser, WorkspaceAccess };

export type GuardEvent = Pick<RequestEvent, 'locals' | 'params' | 'url' | 'route'>;

function isApiRoute(event: GuardEvent): boolean {
	return event.route.id?.startsWith('/api/') ?? event.url.pathname.startsWith('/api/');
}

// API routes answer with JSON problems (caught by apiRoute); pages redirect to sign-in or show the
// error page. Either way the decision is made here, once.
function deny(event: GuardEvent, status: 401 | 403 | 404, message: string): never {
	if (isApiRoute(event)) throw new Problem(status, message);
	if (status === 401) {
		const callbackUrl = event.url.pathname + event.url.search;
		redirect(303, `/signin?${new URLSearchParams({ callbackUrl })}`);
	}
	error(status, message);
}

export function requireUser(event: GuardEvent): SessionUser {
	return event.locals.user ?? deny(event, 401, 'Sign in first.');
}

/**
 * Resolves `params.ws` to the workspace and the signed-in user's membership. Someone who is not a
 * member gets the same 404 as for a workspace that does not exist, so nothing leaks.
 */
export async function requireRole(event: GuardEvent, minimum: Role): Promise<WorkspaceAccess> {
	const user = requireUser(event);
	const { db } = event.locals.services;
	const slug = event.params.ws;
	const workspace = slug ? await findWorkspaceBySlug(db, slug) : undefined;
	const membership = workspace ? await findMembership(db, workspace.id, user.id) : undefined;
	if (!workspace || !membership) deny(event, 404, 'Workspace not found.');
	if (!roleAtLeast(membership.role, minimum)) {
		deny(
			event,
			403,
			`This needs the ${minimum} role in this workspace (your role: ${membership.role}).`
		);
	}
	return {
		user,
		workspace: { id: workspace.id, slug: workspace.slug, name: workspace.name },
		role: membership.role
	};
}
