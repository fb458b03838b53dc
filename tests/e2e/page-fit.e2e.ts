/**
 * The main pages at a laptop's 1440×900 and a phone's 390×844: no page scrolls sideways (wide
 * tables scroll inside their own box), and axe-core finds no serious or critical accessibility
 * violation (WCAG 2.x rules as axe-core implements them).
 */
import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { decodeWithLatest, DEMO_SLUG, plotChannel, uploadAndProcess } from './capture-helpers';
import { signIn } from './helpers';

const CLUB_MAP = 'Club racer engine controller';

/** The main pages, reached the way a person does; the capture page decoded with a channel plotted. */
async function mainPages(page: Page): Promise<{ name: string; path: string }[]> {
	const captureId = await uploadAndProcess(page);
	await page.goto(`/w/${DEMO_SLUG}/maps`);
	await page.getByRole('link', { name: CLUB_MAP, exact: true }).click();
	await expect(page.getByRole('heading', { level: 1, name: CLUB_MAP })).toBeVisible();
	const mapPath = new URL(page.url()).pathname;
	return [
		{ name: 'workspace home', path: `/w/${DEMO_SLUG}` },
		{ name: 'maps', path: `/w/${DEMO_SLUG}/maps` },
		{ name: 'map editor', path: mapPath },
		{ name: 'frame editor', path: `${mapPath}/frames/0` },
		{ name: 'revision', path: `${mapPath}/revisions/1` },
		{ name: 'reference sheet', path: `${mapPath}/sheet?rev=1` },
		{ name: 'captures', path: `/w/${DEMO_SLUG}/captures` },
		{ name: 'capture workbench', path: `/w/${DEMO_SLUG}/captures/${captureId}` },
		{ name: 'tools', path: `/w/${DEMO_SLUG}/tools` },
		{ name: 'tool notes', path: `/w/${DEMO_SLUG}/tools/notes` },
		{ name: 'wiring checklist', path: `/w/${DEMO_SLUG}/tools/wiring` },
		{ name: 'members', path: `/w/${DEMO_SLUG}/members` }
	];
}

async function openPage(page: Page, path: string) {
	await page.goto(path);
	await expect(page.getByRole('heading', { level: 1 }).first()).toBeVisible();
	if (path.includes('/captures/')) {
		await decodeWithLatest(page);
		await plotChannel(page, 'EEC1 · EngineSpeed');
	}
}

const horizontalOverflow = (page: Page) =>
	page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);

for (const size of [
	{ width: 1440, height: 900 },
	{ width: 390, height: 844 }
]) {
	test(`no main page scrolls sideways at ${size.width}×${size.height}`, async ({ page }) => {
		test.setTimeout(240_000);
		// Signed in at the default size: on a phone the account menu sits inside the header's menu.
		await signIn(page, 'owner@framewright.test');
		await page.setViewportSize(size);
		for (const { name, path } of await mainPages(page)) {
			await openPage(page, path);
			expect(await horizontalOverflow(page), `${name} (${path}) scrolls sideways`).toBe(0);
		}
	});
}

test('the frames table of the map editor fits at 1440 px: Lint and the row actions are on screen', async ({
	page
}) => {
	await page.setViewportSize({ width: 1440, height: 900 });
	await signIn(page, 'calibrator@framewright.test');
	await page.goto(`/w/${DEMO_SLUG}/maps`);
	await page.getByRole('link', { name: CLUB_MAP, exact: true }).click();
	const grid = page.getByRole('grid', { name: 'Frames' });
	await expect(grid).toBeVisible();
	for (const header of ['Lint', 'Actions']) {
		const cell = grid.getByRole('columnheader', { name: header });
		const box = (await cell.boundingBox())!;
		expect(box.x + box.width, `${header} column cut off`).toBeLessThanOrEqual(1440);
		// Nothing scrolls sideways inside the table's own box either.
		expect(
			await grid.evaluate((table) => {
				const box = table.parentElement!;
				return box.scrollWidth - box.clientWidth;
			})
		).toBeLessThanOrEqual(0);
	}
});

test('axe-core finds no serious or critical violation on the main pages', async ({ page }) => {
	test.setTimeout(240_000);
	await page.setViewportSize({ width: 1440, height: 900 });
	await signIn(page, 'owner@framewright.test');
	const pages = [{ name: 'sign-in', path: '/signin' }, ...(await mainPages(page))];
	const found: string[] = [];
	const scan = async (name: string, builder = new AxeBuilder({ page })) => {
		const { violations } = await builder.analyze();
		for (const v of violations.filter((v) => v.impact === 'serious' || v.impact === 'critical')) {
			found.push(
				`${name}: ${v.id} (${v.impact}) at ${v.nodes
					.slice(0, 3)
					.map((n) => n.target.join(' '))
					.join(' | ')}`
			);
		}
	};
	for (const { name, path } of pages) {
		await openPage(page, path);
		await scan(name);
		if (!path.includes('/captures/')) continue;
		// Every panel of the workbench, opened one by one.
		const tabs = page.getByRole('tablist', { name: 'Panels' }).getByRole('tab');
		for (const tab of await tabs.allInnerTexts()) {
			await page.getByRole('tab', { name: tab, exact: true }).click();
			await scan(`${name}, ${tab} panel`, new AxeBuilder({ page }).include('[role="tabpanel"]'));
		}
	}
	expect(found).toEqual([]);
});
