import type { Role } from '../roles';

/** The signed-in person, as the request pipeline puts it on `event.locals.user`. */
export interface SessionUser {
	id: string;
	email: string;
	name: string | null;
}

/** What the guard (`requireRole`) hands a route: who asks, in which workspace, with which role. */
export interface WorkspaceAccess {
	user: SessionUser;
	workspace: { id: string; slug: string; name: string };
	role: Role;
}
