import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { endpoints } from '../api/endpoints';
import type { SessionUser, WorkspaceAccess } from './access';
import { findWorkspaceBySlug } from './workspaces/workspaces';
import { findMembership } from './workspaces/members';
import { Problem } from './problem';
import { setActingToken } from './request-context';
import { effectiveRole, recordTokenUse, type TokenGrant } from './tokens/tokens';
import { roleAtLeast, type Role } from '../roles';

export type { SessionUser, WorkspaceAccess };

export type GuardEvent = Pick<RequestEvent, 'locals' | 'params' | 'url' | 'route' | 'request'>;

function isApiRoute(event: GuardEvent): boolean {
	return event.route.id?.startsWith('/api/') ?? event.url.pathname.startsWith('/api/');
}

// The routes of the API contract (src/lib/api/endpoints.ts) as SvelteKit names them: the JSON API
// and the file downloads beside it. Only these accept an access token.
const contractRoutes = new Set(
	Object.values(endpoints).map((e) => `${e.method} ${e.path.replace(/\{(\w+)\}/g, '[$1]')}`)
);

function isContractRoute(event: GuardEvent): boolean {
	const method = event.request.method === 'HEAD' ? 'GET' : event.request.method;
	return contractRoutes.has(`${method} ${event.route.id}`);
}

export const TOKEN_NOT_VALID =
	'The access token is not valid: it is mistyped, revoked or expired. Make a new one on the workspace’s Access tokens page.';
export const TOKEN_NOT_FOR_PAGES =
	'Access tokens work with the API and its downloads only. Sign in to use the pages and forms.';

// API routes answer with JSON problems (caught by apiRoute); pages redirect to sign-in or show the
// error page. Either way the decision is made here, once. A script that sent a token gets the
// status, never a sign-in page.
function deny(event: GuardEvent, status: 401 | 403 | 404, message: string): never {
	if (isApiRoute(event)) throw new Problem(status, message);
	if (status === 401 && !event.locals.bearer) {
		const callbackUrl = event.url.pathname + event.url.search;
		redirect(303, `/signin?${new URLSearchParams({ callbackUrl })}`);
	}
	error(status, message);
}

/**
 * The access token the request carries, once the guard accepts it for this route; null without one.
 * Pages and form actions refuse every token (403), and an invalid token is a 401 even when a
 * session cookie came along: the caller chose the token.
 */
function tokenGrant(event: GuardEvent): TokenGrant | null {
	const bearer = event.locals.bearer;
	if (!bearer) return null;
	if (!isContractRoute(event)) deny(event, 403, TOKEN_NOT_FOR_PAGES);
	if (!bearer.ok) deny(event, 401, TOKEN_NOT_VALID);
	return bearer.grant;
}

/** The signed-in person, or the maker of the access token the request carries. */
export function requireUser(event: GuardEvent): SessionUser {
	return tokenGrant(event)?.user ?? event.locals.user ?? deny(event, 401, 'Sign in first.');
}

/**
 * The signed-in person, for what only a person may do across workspaces (creating one): an access
 * token, confined to its own workspace, is refused with 403.
 */
export function requireSessionUser(event: GuardEvent): SessionUser {
	if (tokenGrant(event)) {
		deny(
			event,
			403,
			'An access token works only inside its own workspace; sign in to create a workspace.'
		);
	}
	return requireUser(event);
}

/** The workspace and role an access token confines the request to, or null for a session. */
export function tokenScope(event: GuardEvent): { workspaceId: string; role: Role } | null {
	const grant = tokenGrant(event);
	return grant ? { workspaceId: grant.workspaceId, role: grant.role } : null;
}

/**
 * Resolves `params.ws` to the workspace and the caller's membership. Someone who is not a member
 * gets the same 404 as for a workspace that does not exist, so nothing leaks; so does an access
 * token used outside its own workspace. A token acts at the lower of its role and its maker's
 * current role; its use is recorded (last use and audit, at most once a minute).
 */
export async function requireRole(event: GuardEvent, minimum: Role): Promise<WorkspaceAccess> {
	const grant = tokenGrant(event);
	const user = grant?.user ?? requireUser(event);
	const { db } = event.locals.services;
	const slug = event.params.ws;
	const workspace = slug ? await findWorkspaceBySlug(db, slug) : undefined;
	const membership = workspace ? await findMembership(db, workspace.id, user.id) : undefined;
	if (!workspace || !membership || (grant && grant.workspaceId !== workspace.id))
		deny(event, 404, 'Workspace not found.');
	const role = grant ? effectiveRole(grant.role, membership.role) : membership.role;
	if (!roleAtLeast(role, minimum)) {
		const whose = grant ? `this access token’s role: ${role}` : `your role: ${role}`;
		deny(event, 403, `This needs the ${minimum} role in this workspace (${whose}).`);
	}
	if (grant) {
		setActingToken(grant.id);
		await recordTokenUse(db, grant, { method: event.request.method, path: event.url.pathname });
	}
	return {
		user,
		workspace: { id: workspace.id, slug: workspace.slug, name: workspace.name },
		role
	};
}
