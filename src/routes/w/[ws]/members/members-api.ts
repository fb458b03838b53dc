/**
 * Client for the members JSON API (contract: /api/workspaces/[ws]/…).
 * Every failure becomes an ApiError whose message a person can read.
 */
import type { Role } from '$lib/components/roles';
import { ApiError, fieldIssues, messageOf, requestJson, type ApiIssue } from '$lib/api/client';
// The row shapes are the server's own (type-only imports: erased, nothing server-side ships).
import type { MemberView as Member } from '$lib/server/db/members';
import type { InvitationView as Invitation } from '$lib/server/db/invitations';

export { ApiError, fieldIssues, messageOf };
export type { ApiIssue, Invitation, Member };

export interface MembersOverview {
	members: Member[];
	invitations: Invitation[];
	myRole: Role;
	myUserId: string;
}

// Words for statuses whose answer carries no message of its own, in this page's terms.
const fallbacks = {
	404: 'That member, invitation or workspace no longer exists.',
	409: 'That would leave the workspace without an owner. Make someone else owner first.'
};

const call = <T>(fetcher: typeof fetch, method: string, url: string, body?: unknown) =>
	requestJson<T>(fetcher, method, url, body, fallbacks);

export function membersApi(slug: string, fetcher: typeof fetch = fetch) {
	const base = `/api/workspaces/${encodeURIComponent(slug)}`;
	return {
		overview: () => call<MembersOverview>(fetcher, 'GET', `${base}/members`),
		changeRole: (userId: string, role: Role) =>
			call<{ member: Member }>(fetcher, 'PATCH', `${base}/members/${encodeURIComponent(userId)}`, {
				role
			}),
		remove: (userId: string) =>
			call<void>(fetcher, 'DELETE', `${base}/members/${encodeURIComponent(userId)}`),
		invite: (email: string, role: Role) =>
			call<{ invitation: Invitation }>(fetcher, 'POST', `${base}/invitations`, { email, role }),
		revoke: (invitationId: string) =>
			call<void>(fetcher, 'DELETE', `${base}/invitations/${encodeURIComponent(invitationId)}`)
	};
}

export type MembersApi = ReturnType<typeof membersApi>;
