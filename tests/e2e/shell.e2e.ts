import { expect, test, type Page } from '@playwright/test';
import { signIn, uniqueEmail } from './helpers';

/** Describes the focused element the way a screen reader would announce it (role + name). */
async function focusedName(page: Page): Promise<string> {
	return page.evaluate(() => {
		const el = document.activeElement as HTMLElement | null;
		if (!el) return '';
		const label = el.getAttribute('aria-label') ?? el.textContent ?? '';
		return `${el.tagName.toLowerCase()}:${label.replace(/\s+/g, ' ').trim()}`;
	});
}

async function bodyBackground(page: Page): Promise<string> {
	return page.evaluate(() => getComputedStyle(document.body).backgroundColor);
}

test('signed out: the landing states the job and offers sign-in; the skip link comes first', async ({
	page
}) => {
	await page.goto('/');
	await expect(page.getByRole('main')).toContainText('CAN buses');
	await expect(page.getByRole('main').getByRole('link', { name: 'Sign in' })).toBeVisible();

	await page.keyboard.press('Tab');
	const skip = page.getByRole('link', { name: 'Skip to content' });
	await expect(skip).toBeFocused();
	await expect(skip).toBeInViewport();
	await page.keyboard.press('Enter');
	await expect(page.getByRole('main')).toBeFocused();
});

test('a sign-in link used a second time gets a clear message, not a session', async ({
	browser
}) => {
	const first = await browser.newContext();
	const link = await signIn(await first.newPage(), uniqueEmail('once'));
	await first.close();

	const second = await browser.newContext();
	const page = await second.newPage();
	await page.goto(link);
	await expect(page).toHaveURL(/\/signin\/error/);
	await expect(page.getByRole('heading', { name: 'Sign-in problem' })).toBeVisible();
	await expect(page.getByRole('alert')).toContainText(/already used/i);
	await expect(page.getByRole('button', { name: /account menu/i })).toHaveCount(0);
	await page.getByRole('link', { name: 'Get a new sign-in link' }).click();
	await expect(page.getByRole('heading', { name: 'Sign in' })).toBeVisible();
	await second.close();
});

test('keyboard only: Tab reaches the skip link, switcher, navigation and user menu', async ({
	page
}) => {
	await signIn(page, uniqueEmail('keys'));
	await page.goto('/');
	await page.getByLabel('Workspace name').fill('Keyboard bench');
	await page.getByRole('button', { name: 'Create workspace' }).click();
	await expect(page).toHaveURL(/\/w\/[^/]+\/maps$/);
	const slug = new URL(page.url()).pathname.split('/')[2];

	// Walk the header with Tab alone and record what gets focus, in order.
	await page.locator('body').focus();
	await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
	const seen: string[] = [];
	for (let i = 0; i < 14; i++) {
		await page.keyboard.press('Tab');
		seen.push(await focusedName(page));
	}
	expect(seen[0]).toBe('a:Skip to content');
	const order = [
		'Skip to content',
		'Framewright home',
		'Workspace:',
		'Maps',
		'Receivers',
		'Captures',
		'Tools',
		'Members',
		'Access tokens',
		'Audit log',
		'Account menu'
	];
	let at = -1;
	for (const expected of order) {
		const found = seen.findIndex((s, i) => i > at && s.includes(expected));
		expect(
			found,
			`"${expected}" reached by Tab after position ${at} in ${JSON.stringify(seen)}`
		).toBeGreaterThan(at);
		at = found;
	}
	// The active section is marked for assistive technology.
	await expect(page.getByRole('link', { name: 'Maps' })).toHaveAttribute('aria-current', 'page');

	// The workspace switcher opens with the arrow key and its links are reachable the same way.
	const switcher = page.getByRole('button', { name: /workspace:/i });
	await switcher.focus();
	await page.keyboard.press('ArrowDown');
	await expect(switcher).toHaveAttribute('aria-expanded', 'true');
	await expect(page.getByRole('link', { name: /Keyboard bench/ })).toBeFocused();
	await page.keyboard.press('Escape');
	await expect(switcher).toHaveAttribute('aria-expanded', 'false');
	await expect(switcher).toBeFocused();

	// The user menu opens with Enter and holds the e-mail, the theme toggle and sign-out.
	const menu = page.getByRole('button', { name: /account menu/i });
	await menu.focus();
	await page.keyboard.press('Enter');
	await expect(menu).toHaveAttribute('aria-expanded', 'true');
	await page.keyboard.press('Tab');
	await expect(page.getByRole('button', { name: 'Dark theme' })).toBeFocused();
	await page.keyboard.press('Tab');
	await expect(page.getByRole('button', { name: 'Sign out' })).toBeFocused();
	await page.keyboard.press('Escape');
	await expect(menu).toBeFocused();

	// Navigation by keyboard: Enter on a nav link moves there.
	await page.getByRole('link', { name: 'Members' }).focus();
	await page.keyboard.press('Enter');
	await expect(page).toHaveURL(new RegExp(`/w/${slug}/members$`));
	await expect(page.getByRole('link', { name: 'Members' })).toHaveAttribute('aria-current', 'page');
});

test('both themes render: the toggle switches the dark class and the colours, and is remembered', async ({
	browser
}) => {
	const context = await browser.newContext({ colorScheme: 'light' });
	const page = await context.newPage();
	await signIn(page, uniqueEmail('themes'));
	const html = page.locator('html');

	await expect(html).not.toHaveClass(/\bdark\b/);
	const lightBackground = await bodyBackground(page);

	await page.getByRole('button', { name: /account menu/i }).click();
	const toggle = page.getByRole('button', { name: 'Dark theme' });
	await expect(toggle).toHaveAttribute('aria-pressed', 'false');
	await toggle.click();
	await expect(toggle).toHaveAttribute('aria-pressed', 'true');
	await expect(html).toHaveClass(/\bdark\b/);
	const darkBackground = await bodyBackground(page);
	expect(darkBackground).not.toBe(lightBackground);
	expect(await page.evaluate(() => localStorage.getItem('fw-theme'))).toBe('dark');

	// The choice outlives a reload even though the system prefers light.
	await page.reload();
	await expect(html).toHaveClass(/\bdark\b/);
	expect(await bodyBackground(page)).toBe(darkBackground);

	// And back.
	await page.getByRole('button', { name: /account menu/i }).click();
	await page.getByRole('button', { name: 'Dark theme' }).click();
	await expect(html).not.toHaveClass(/\bdark\b/);
	expect(await bodyBackground(page)).toBe(lightBackground);
	await context.close();
});

test('without a saved choice the theme follows the system preference', async ({ browser }) => {
	const context = await browser.newContext({ colorScheme: 'dark' });
	const page = await context.newPage();
	await page.goto('/');
	await expect(page.locator('html')).toHaveClass(/\bdark\b/);
	await page.emulateMedia({ colorScheme: 'light' });
	await expect(page.locator('html')).not.toHaveClass(/\bdark\b/);
	await context.close();
});

test('the header is one row at 1280 px with all seven sections, and a menu on a 390 px phone', async ({
	page
}) => {
	// The demo owner sees every section, the audit log included; the demo workspace and the
	// owner's display name are longer than a test workspace's.
	await page.setViewportSize({ width: 1280, height: 800 });
	await signIn(page, 'owner@framewright.test');
	await page.goto('/w/quillmoor-club-racing/maps');
	const header = page.getByRole('banner');
	const nav = header.getByRole('navigation', { name: 'Workspace' });
	await expect(nav.getByRole('link')).toHaveCount(7);
	const home = (await header.getByRole('link', { name: 'Framewright home' }).boundingBox())!;
	const middle = (box: { y: number; height: number }) => box.y + box.height / 2;
	const inBar = [
		header.getByRole('button', { name: /workspace:/i }),
		...(await nav.getByRole('link').all()),
		header.getByRole('button', { name: /account menu/i })
	];
	for (const item of inBar) {
		const box = (await item.boundingBox())!;
		expect(
			Math.abs(middle(box) - middle(home)),
			`${await item.textContent()} is on another row`
		).toBeLessThan(8);
		expect(box.x + box.width).toBeLessThanOrEqual(1280);
	}

	// A phone: one row with the wordmark and a menu that holds the sections.
	await page.setViewportSize({ width: 390, height: 844 });
	await expect(nav).toBeHidden();
	const menu = header.getByRole('button', { name: 'Menu' });
	await expect(menu).toBeVisible();
	const phoneHome = (await header.getByRole('link', { name: 'Framewright home' }).boundingBox())!;
	expect(Math.abs(middle((await menu.boundingBox())!) - middle(phoneHome))).toBeLessThan(8);
	await menu.click();
	await expect(header.getByRole('link', { name: 'Audit log' })).toBeVisible();
	expect(
		await page.evaluate(
			() => document.documentElement.scrollWidth - document.documentElement.clientWidth
		)
	).toBe(0);
});
