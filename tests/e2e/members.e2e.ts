import { expect, test } from '@playwright/test';
import { createWorkspace, signIn, uniqueEmail, workspaceLink } from './helpers';

test('members page: field errors sit next to the field, revoke works, the last owner is protected', async ({
	page
}) => {
	const ownerEmail = uniqueEmail('solo');
	await signIn(page, ownerEmail);
	await createWorkspace(page, 'Harness bench');
	await workspaceLink(page, 'Members').click();

	// A bad address is refused by the server and the reason is tied to the field (aria-describedby).
	const address = page.getByLabel('E-mail address');
	await address.fill('not-an-address');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(address).toHaveAttribute('aria-invalid', 'true');
	const describedBy = await address.getAttribute('aria-describedby');
	expect(describedBy).toBeTruthy();
	const explanation = page.locator(`[id="${describedBy!.split(' ').pop()}"]`);
	await expect(explanation).not.toBeEmpty();
	await expect(address).toHaveValue('not-an-address');

	// A pending invitation can be revoked.
	const invitee = uniqueEmail('maybe');
	await address.fill(invitee);
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByText(`Invitation sent to ${invitee}.`)).toBeVisible();
	await page.getByRole('button', { name: `Revoke invitation for ${invitee}` }).click();
	await expect(page.getByText(`Invitation for ${invitee} revoked.`)).toBeVisible();
	await expect(page.getByRole('button', { name: `Revoke invitation for ${invitee}` })).toHaveCount(
		0
	);

	// The only owner cannot leave (no button) nor demote themself (the server's 409 is shown by the
	// role picker it was for).
	await expect(page.getByRole('button', { name: 'Leave workspace' })).toHaveCount(0);
	await expect(page.getByText(/Only owner/)).toBeVisible();
	const myRole = page.getByLabel(`Role of ${ownerEmail}`);
	await myRole.selectOption('viewer');
	await page.getByRole('button', { name: `Change role for ${ownerEmail}` }).click();
	await expect(page.getByRole('alert')).toContainText('last owner');
	await expect(myRole).toHaveAttribute('aria-invalid', 'true');
	await expect(myRole).toHaveValue('owner');
	await page.reload();
	await expect(page.getByLabel(`Role of ${ownerEmail}`)).toHaveValue('owner');
});
