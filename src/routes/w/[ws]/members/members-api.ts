/**
 * Client for the members JSON API (contract: /api/workspaces/[ws]/…).
 * Every failure becomes an ApiError whose message a person can read.
 */
import type { Role } from '$lib/components/roles';
// The row shapes are the server's own (type-only imports: erased, nothing server-side ships).
import type { MemberView as Member } from '$lib/server/db/members';
import type { InvitationView as Invitation } from '$lib/server/db/invitations';
import type { Issue as ApiIssue } from '$lib/server/problem';

export type { ApiIssue, Invitation, Member };

export interface MembersOverview {
	members: Member[];
	invitations: Invitation[];
	myRole: Role;
	myUserId: string;
}

export class ApiError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly issues: ApiIssue[] = []
	) {
		super(message);
		this.name = 'ApiError';
	}
}

// Used when the server's body carries no message of its own (e.g. a proxy error page).
const fallbackByStatus: Record<number, string> = {
	400: 'Some of the values were not accepted.',
	401: 'Your session has ended. Sign in again to continue.',
	403: 'Your role in this workspace does not allow that.',
	404: 'That member, invitation or workspace no longer exists.',
	409: 'That would leave the workspace without an owner. Make someone else owner first.'
};

async function call<T>(fetcher: typeof fetch, method: string, url: string, body?: unknown): Promise<T> {
	let response: Response;
	try {
		response = await fetcher(url, {
			method,
			headers: body === undefined ? undefined : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		throw new ApiError(0, 'The server could not be reached. Check your connection and try again.');
	}
	if (response.status === 204) return undefined as T;
	const payload: unknown = await response.json().catch(() => null);
	if (!response.ok) {
		const p = (payload ?? {}) as { error?: unknown; issues?: unknown };
		const message =
			typeof p.error === 'string' && p.error
				? p.error
				: (fallbackByStatus[response.status] ?? `The server answered ${response.status}.`);
		throw new ApiError(response.status, message, Array.isArray(p.issues) ? (p.issues as ApiIssue[]) : []);
	}
	return payload as T;
}

export function membersApi(slug: string, fetcher: typeof fetch = fetch) {
	const base = `/api/workspaces/${encodeURIComponent(slug)}`;
	return {
		overview: () => call<MembersOverview>(fetcher, 'GET', `${base}/members`),
		changeRole: (userId: string, role: Role) =>
			call<{ member: Member }>(fetcher, 'PATCH', `${base}/members/${encodeURIComponent(userId)}`, { role }),
		remove: (userId: string) => call<void>(fetcher, 'DELETE', `${base}/members/${encodeURIComponent(userId)}`),
		invite: (email: string, role: Role) =>
			call<{ invitation: Invitation }>(fetcher, 'POST', `${base}/invitations`, { email, role }),
		revoke: (invitationId: string) =>
			call<void>(fetcher, 'DELETE', `${base}/invitations/${encodeURIComponent(invitationId)}`)
	};
}

export type MembersApi = ReturnType<typeof membersApi>;

/** Field messages of a 400 answer, keyed by the field name (`issues[].path`). */
export function fieldIssues(error: unknown): Record<string, string[]> {
	const out: Record<string, string[]> = {};
	if (error instanceof ApiError) for (const i of error.issues) (out[i.path] ??= []).push(i.message);
	return out;
}

export function messageOf(error: unknown): string {
	return error instanceof Error ? error.message : 'Something went wrong. Please try again.';
}
