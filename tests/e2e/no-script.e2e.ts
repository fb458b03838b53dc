import { expect, test } from '@playwright/test';
import { createBlankMap, createWorkspace, signIn, uniqueEmail, workspaceLink } from './helpers';

// Every plain form is a form action: the whole journey works with scripts off.
test.use({ javaScriptEnabled: false });

test('without JavaScript: sign in, invite (a bad address first), rename a map, publish it with a note, sign out', async ({
	page
}) => {
	const ownerEmail = uniqueEmail('noscript');
	await signIn(page, ownerEmail);

	// A workspace of one's own.
	const slug = await createWorkspace(page, `Wiring loom ${Date.now().toString(36)}`);

	// Invite: the server's reason for a bad address is tied to the field, and what was typed stays.
	await workspaceLink(page, 'Members').click();
	const address = page.getByLabel('E-mail address');
	await address.fill('not-an-address');
	await page.getByLabel('Role', { exact: true }).selectOption('editor');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(address).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByText('Enter a valid e-mail address.')).toBeVisible();
	await expect(address).toHaveValue('not-an-address');
	await expect(page.getByLabel('Role', { exact: true })).toHaveValue('editor');
	const colleague = uniqueEmail('colleague');
	await address.fill(colleague);
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByText(`Invitation sent to ${colleague}.`)).toBeVisible();
	await expect(
		page.getByRole('button', { name: `Revoke invitation for ${colleague}` })
	).toBeVisible();

	// A blank map, renamed.
	const mapName = `Door module ${Date.now().toString(36)}`;
	const mapPath = await createBlankMap(page, slug, mapName);
	const settings = page.getByRole('region', { name: 'Map settings' });
	await settings.getByLabel('Map name').fill(`${mapName} rear`);
	await settings.getByRole('button', { name: 'Rename' }).click();
	await expect(page.getByText(`Renamed to ${mapName} rear.`)).toBeVisible();
	await expect(page.getByRole('heading', { level: 1, name: `${mapName} rear` })).toBeVisible();

	// Publish: the button opens the dialog by reloading the page with it open.
	await page.getByRole('button', { name: 'Publish…' }).click();
	let dialog = page.getByRole('dialog', { name: 'Publish r1' });
	await expect(dialog).toBeVisible();
	// Meanwhile someone saves the draft elsewhere: the page's draft version is now stale.
	const mapId = mapPath.split('/').pop();
	const elsewhere = await page.request.patch(`/api/workspaces/${slug}/maps/${mapId}`, {
		data: { name: `${mapName} rear door`, version: 2 }
	});
	expect(elsewhere.status()).toBe(200);
	await dialog.getByLabel('Revision note').fill('Rear door module, first bench figures.');
	await dialog.getByRole('button', { name: 'Publish r1' }).click();
	// Refused, with who changed it; the dialog is open again with the note as typed.
	dialog = page.getByRole('dialog', { name: 'Publish r1' });
	await expect(dialog.getByRole('alert')).toContainText(`changed by ${ownerEmail}`);
	await expect(dialog.getByLabel('Revision note')).toHaveValue(
		'Rear door module, first bench figures.'
	);
	// The page came back with the current draft version, so sending again publishes.
	await dialog.getByRole('button', { name: 'Publish r1' }).click();
	await expect(page.getByText('Published r1.')).toBeVisible();
	const history = page.getByRole('list', { name: 'Revision history' });
	await expect(history.getByRole('link', { name: 'r1' })).toBeVisible();
	await expect(history).toContainText('Rear door module, first bench figures.');

	// The audit log is a plain GET form too.
	await page.goto(`/w/${slug}/audit?kind=map.publish`);
	await expect(page.getByRole('table', { name: /Audit log entries/ })).toContainText(
		`published r1 of ${mapName} rear door`
	);

	// Sign out (the account menu needs scripts; its form is offered beside it).
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page.getByRole('link', { name: 'Sign in' }).first()).toBeVisible();
	const after = await page.goto(`/w/${slug}/maps`);
	expect(new URL(after!.url()).pathname).toBe('/signin');
});
