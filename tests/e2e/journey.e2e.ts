import { expect, test } from '@playwright/test';
import { openNewestMail, signIn, uniqueEmail } from './helpers';

test('an owner invites a colleague, makes them Viewer, and the server refuses the viewer owner actions', async ({
	browser
}) => {
	const ownerEmail = uniqueEmail('owner');
	const colleagueEmail = uniqueEmail('colleague');
	const workspaceName = `Dyno cell ${Date.now().toString(36)}`;

	// The owner signs in with the link from the stand-in mailbox and creates a workspace.
	const ownerContext = await browser.newContext();
	const owner = await ownerContext.newPage();
	await signIn(owner, ownerEmail);
	await owner.goto('/');
	await owner.getByLabel('Workspace name').fill(workspaceName);
	await owner.getByRole('button', { name: 'Create workspace' }).click();
	await expect(owner).toHaveURL(/\/w\/[^/]+\/maps$/);
	const slug = new URL(owner.url()).pathname.split('/')[2];
	await expect(owner.getByRole('button', { name: /workspace:/i })).toContainText(workspaceName);

	// …opens Members from the workspace navigation and invites the colleague as Editor.
	const nav = owner.getByRole('navigation', { name: 'Workspace' });
	await nav.getByRole('link', { name: 'Members' }).click();
	await expect(nav.getByRole('link', { name: 'Members' })).toHaveAttribute('aria-current', 'page');
	await owner.getByLabel('E-mail address').fill(colleagueEmail);
	await owner.getByLabel('Role', { exact: true }).selectOption('editor');
	await owner.getByRole('button', { name: 'Send invitation' }).click();
	await expect(owner.getByText(`Invitation sent to ${colleagueEmail}.`)).toBeVisible();
	await expect(
		owner.getByRole('button', { name: `Revoke invitation for ${colleagueEmail}` })
	).toBeVisible();

	// The colleague, in a browser of their own, opens the e-mailed invitation, signs in and accepts.
	const colleagueContext = await browser.newContext();
	const colleague = await colleagueContext.newPage();
	await openNewestMail(colleague, colleagueEmail, /invitation to the workspace/i);
	await colleague
		.getByRole('region', { name: 'Links in this message' })
		.getByRole('link')
		.first()
		.click();
	await expect(colleague.getByRole('heading', { name: 'Workspace invitation' })).toBeVisible();
	await expect(colleague.getByText(workspaceName)).toBeVisible();
	const invitationPath = new URL(colleague.url()).pathname;
	await expect(colleague.getByRole('link', { name: 'Sign in to accept' })).toBeVisible();

	await signIn(colleague, colleagueEmail, invitationPath);
	await expect(colleague).toHaveURL(new RegExp(`${invitationPath}$`));
	await colleague.getByRole('button', { name: `Accept and join ${workspaceName}` }).click();
	await expect(colleague).toHaveURL(new RegExp(`/w/${slug}/maps$`));
	await colleague.goto(`/w/${slug}`);
	await expect(colleague.getByRole('heading', { level: 1, name: workspaceName })).toBeVisible();
	await expect(colleague.getByRole('main')).toContainText('You are Editor here');

	// The owner sees the new member and makes them Viewer.
	await owner.reload();
	const colleagueRole = owner.getByLabel(`Role of ${colleagueEmail}`);
	await expect(colleagueRole).toHaveValue('editor');
	await colleagueRole.selectOption('viewer');
	// Picking alone changes nothing; the change is sent with its button.
	await owner.getByRole('button', { name: `Change role for ${colleagueEmail}` }).click();
	await expect(owner.getByText(`${colleagueEmail} is now Viewer (was Editor).`)).toBeVisible();
	await expect(
		owner.getByRole('button', { name: `Revoke invitation for ${colleagueEmail}` })
	).toHaveCount(0);

	// The viewer sees the members but none of the owner's controls…
	await colleague.goto(`/w/${slug}/members`);
	const table = colleague.getByRole('table', { name: 'Members of this workspace' });
	await expect(table).toContainText(ownerEmail);
	await expect(colleague.getByText('Your role:')).toContainText('Viewer');
	await expect(colleague.getByRole('combobox')).toHaveCount(0);
	await expect(colleague.getByRole('button', { name: 'Send invitation' })).toHaveCount(0);
	await expect(colleague.getByRole('button', { name: /^Remove/ })).toHaveCount(0);
	await expect(colleague.getByRole('button', { name: 'Leave workspace' })).toBeVisible();

	// …and the server refuses the same actions when asked directly with the viewer's session.
	const overview = await (await colleague.request.get(`/api/workspaces/${slug}/members`)).json();
	expect(overview.myRole).toBe('viewer');
	expect(overview.invitations).toEqual([]);
	const ownerId: string = overview.members.find(
		(m: { email: string }) => m.email === ownerEmail
	).userId;

	const demote = await colleague.request.patch(`/api/workspaces/${slug}/members/${ownerId}`, {
		data: { role: 'viewer' }
	});
	expect(demote.status()).toBe(403);
	const invite = await colleague.request.post(`/api/workspaces/${slug}/invitations`, {
		data: { email: uniqueEmail('intruder'), role: 'owner' }
	});
	expect(invite.status()).toBe(403);
	const removeOwner = await colleague.request.delete(`/api/workspaces/${slug}/members/${ownerId}`);
	expect(removeOwner.status()).toBe(403);
	// The same refusal from the page itself (same origin, same cookie) as the UI would send it.
	const fromPage = await colleague.evaluate(
		async ([ws, id]) =>
			(
				await fetch(`/api/workspaces/${ws}/members/${id}`, {
					method: 'PATCH',
					headers: { 'content-type': 'application/json' },
					body: JSON.stringify({ role: 'owner' })
				})
			).status,
		[slug, ownerId]
	);
	expect(fromPage).toBe(403);

	// Nothing changed on the owner's side.
	await owner.reload();
	await expect(owner.getByLabel(`Role of ${ownerEmail}`)).toHaveValue('owner');
	await expect(owner.getByLabel(`Role of ${colleagueEmail}`)).toHaveValue('viewer');

	await ownerContext.close();
	await colleagueContext.close();
});
