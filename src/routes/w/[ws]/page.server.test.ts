// The workspace page's rename form against a fresh database.
import { describe, expect, it } from 'vitest';
import { findWorkspaceBySlug } from '$lib/server/workspaces/workspaces';
import { createTeamServices, outcome, pageEvents } from '$lib/server/test-support';
import type { SessionUser } from '$lib/server/guard';
import { actions } from './+page.server';

describe('workspace rename action', () => {
	it('renames for owners, keeps the slug, and refuses a bad name next to its field', async () => {
		const { workspace, users, services } = await createTeamServices('Dyno cell');
		const event = pageEvents(services, '/w/[ws]', { ws: workspace.slug });
		const rename = (user: SessionUser, name: string) => actions.rename(event(user, { name }));
		expect(await rename(users.owner, 'x')).toMatchObject({
			status: 400,
			data: { errors: { name: ['Use at least 2 characters.'] }, values: { name: 'x' } }
		});
		expect(await rename(users.owner, ' Dyno cell B ')).toEqual({
			action: 'rename',
			ok: true,
			message: 'The workspace is now called Dyno cell B.'
		});
		expect(await findWorkspaceBySlug(services.db, workspace.slug)).toMatchObject({
			name: 'Dyno cell B'
		});
		expect(await outcome(() => rename(users.editor, 'Taken over'))).toMatchObject({
			kind: 'error',
			status: 403
		});
	});
});
