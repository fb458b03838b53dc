import { expect, test } from '@playwright/test';
import { createWorkspace, openNewestMail, signIn, uniqueEmail, workspaceLink } from './helpers';

test('an owner changes a role, undoes it, and reads both in the audit log; an editor may not', async ({
	browser
}) => {
	const ownerEmail = uniqueEmail('auditor');
	const colleagueEmail = uniqueEmail('tuner');
	const owner = await (await browser.newContext()).newPage();
	await signIn(owner, ownerEmail);
	const slug = await createWorkspace(owner, `Chassis dyno ${Date.now().toString(36)}`);

	// A colleague joins as Editor.
	await owner.goto(`/w/${slug}/members`);
	await owner.getByLabel('E-mail address').fill(colleagueEmail);
	await owner.getByLabel('Role', { exact: true }).selectOption('editor');
	await owner.getByRole('button', { name: 'Send invitation' }).click();
	await expect(owner.getByText(`Invitation sent to ${colleagueEmail}.`)).toBeVisible();
	const colleague = await (await browser.newContext()).newPage();
	await openNewestMail(colleague, colleagueEmail, /invitation to the workspace/i);
	const invitation = await colleague
		.getByRole('region', { name: 'Links in this message' })
		.getByRole('link')
		.first()
		.getAttribute('href');
	await signIn(colleague, colleagueEmail, new URL(invitation!).pathname);
	await colleague.getByRole('button', { name: /^Accept and join/ }).click();
	await expect(colleague).toHaveURL(new RegExp(`/w/${slug}/maps$`));

	// Picking a role is not yet a change; Change sends it, and Undo (by keyboard) puts it back.
	await owner.reload();
	const role = owner.getByLabel(`Role of ${colleagueEmail}`);
	await role.selectOption('viewer');
	await expect(owner.getByText(/is now/)).toHaveCount(0);
	await owner.getByRole('button', { name: `Change role for ${colleagueEmail}` }).click();
	await expect(owner.getByText(`${colleagueEmail} is now Viewer (was Editor).`)).toBeVisible();
	await expect(owner.getByLabel(`Role of ${colleagueEmail}`)).toHaveValue('viewer');
	await owner.getByRole('button', { name: `Undo: make ${colleagueEmail} Editor again` }).focus();
	await owner.keyboard.press('Enter');
	await expect(owner.getByText(`${colleagueEmail} is now Editor (was Viewer).`)).toBeVisible();
	await expect(owner.getByLabel(`Role of ${colleagueEmail}`)).toHaveValue('editor');

	// The audit log, from the workspace navigation: both changes, in words, newest first.
	await workspaceLink(owner, 'Audit log').click();
	await expect(owner.getByRole('heading', { level: 1, name: 'Audit log' })).toBeVisible();
	const entries = owner.getByRole('table', { name: /Audit log entries/ });
	await owner.getByLabel('Kind').selectOption({ label: 'Role changed' });
	await owner.getByRole('button', { name: 'Show' }).click();
	await expect(entries.getByRole('row')).toHaveCount(3); // the header and two entries
	await expect(entries.getByRole('row').nth(1)).toContainText(
		`${ownerEmail} made ${colleagueEmail} Editor (was Viewer)`
	);
	await expect(entries.getByRole('row').nth(2)).toContainText(
		`${ownerEmail} made ${colleagueEmail} Viewer (was Editor)`
	);
	// By person: what the colleague did.
	await owner.getByLabel('Kind').selectOption('');
	await owner.getByLabel('Person').selectOption({ label: colleagueEmail });
	await owner.getByRole('button', { name: 'Show' }).click();
	await expect(entries).toContainText(
		`${colleagueEmail} accepted the invitation and joined as Editor`
	);
	await expect(entries).not.toContainText(ownerEmail);

	// An editor has no link to it, and the page refuses them.
	await colleague.goto(`/w/${slug}/maps`);
	await expect(workspaceLink(colleague, 'Members')).toBeVisible();
	await expect(workspaceLink(colleague, 'Audit log')).toHaveCount(0);
	const refused = await colleague.goto(`/w/${slug}/audit`);
	expect(refused?.status()).toBe(403);
});
