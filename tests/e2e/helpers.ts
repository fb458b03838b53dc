import { expect, type Locator, type Page } from '@playwright/test';

/** A fresh address per test run, so reruns against one database never collide. */
export function uniqueEmail(who: string): string {
	return `${who}.${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@example.test`;
}

/** Opens the newest message to `email` whose subject matches, from the stand-in mailbox. */
export async function openNewestMail(page: Page, email: string, subject: RegExp): Promise<void> {
	await page.goto(`/dev/mailbox?to=${encodeURIComponent(email)}`);
	await expect(page.getByRole('heading', { name: 'Stand-in mailbox' })).toBeVisible();
	// Newest first: the first matching row is the latest message.
	await page.getByRole('link', { name: subject }).first().click();
	await expect(page.getByRole('heading', { level: 1, name: subject })).toBeVisible();
}

/** Signs in the way a person does: asks for a link, reads it in the mailbox, follows it. Returns the link. */
export async function signIn(page: Page, email: string, callbackUrl?: string): Promise<string> {
	// Count this address's sign-in mails first, so an old (used) link is never followed by mistake.
	const signInMails = async () => {
		await page.goto(`/dev/mailbox?to=${encodeURIComponent(email)}`);
		return page.getByRole('link', { name: /sign-in link/i }).count();
	};
	const before = await signInMails();
	await page.goto(
		callbackUrl ? `/signin?callbackUrl=${encodeURIComponent(callbackUrl)}` : '/signin'
	);
	await page.getByLabel('E-mail address').fill(email);
	await page.getByRole('button', { name: 'E-mail me a sign-in link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your inbox' })).toBeVisible();
	await expect
		.poll(signInMails, { message: `no new sign-in mail reached ${email}` })
		.toBeGreaterThan(before);

	await openNewestMail(page, email, /sign-in link/i);
	const link = page
		.getByRole('region', { name: 'Links in this message' })
		.getByRole('link')
		.first();
	const href = await link.getAttribute('href');
	if (!href) throw new Error(`the sign-in mail to ${email} carries no link`);
	await link.click();
	await expect(page.getByRole('button', { name: /account menu/i })).toBeVisible();
	return href;
}

/** Creates a blank map from a workspace's maps list, as an editor does; returns the new map page's path. */
export async function createBlankMap(
	page: Page,
	workspace: string,
	mapName: string
): Promise<string> {
	await page.goto(`/w/${workspace}/maps`);
	await page.getByLabel('Map name').fill(mapName);
	await page.getByRole('button', { name: 'Create blank map' }).click();
	await expect(page.getByRole('heading', { level: 1, name: mapName })).toBeVisible();
	return new URL(page.url()).pathname;
}

/** Creates a workspace from the home page, as a signed-in person does; returns its slug. */
export async function createWorkspace(page: Page, name: string): Promise<string> {
	await page.goto('/');
	await page.getByLabel('Workspace name').fill(name);
	await page.getByRole('button', { name: 'Create workspace' }).click();
	await expect(page).toHaveURL(/\/w\/[^/]+\/maps$/);
	return new URL(page.url()).pathname.split('/')[2];
}

/** A link of the workspace navigation (Maps, Members, Audit log …). */
export function workspaceLink(page: Page, name: string): Locator {
	return page.getByRole('navigation', { name: 'Workspace' }).getByRole('link', { name });
}
