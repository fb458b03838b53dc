/**
 * Both reference sheets (the workspace's and a share link's) on paper: no site header, footer or
 * buttons, and each frame's bit layout drawn, its bits where docs/bit-numbering.md puts them.
 */
import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { DEMO_SLUG } from './capture-helpers';
import { signIn } from './helpers';

const fixture = JSON.parse(readFileSync('fixtures/club-racer-ecu.map.json', 'utf8')) as {
	name: string;
	frames: {
		name: string;
		signals: { name: string; startBit: number; length: number; byteOrder?: string }[];
	}[];
};

async function expectPrintedSheet(page: Page) {
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('heading', { level: 1, name: `${fixture.name} — r1` })).toBeVisible();
	await expect(page.getByRole('banner')).toBeHidden();
	await expect(page.getByRole('contentinfo')).toBeHidden();
	await expect(page.getByRole('button', { name: 'Print or save as PDF' })).toBeHidden();
	for (const frame of fixture.frames) {
		const layout = page.getByRole('table', { name: `Bit layout of ${frame.name}` });
		await expect(layout).toBeVisible();
		// docs/bit-numbering.md: payload bit b is bit b % 8 of byte ⌊b / 8⌋; a little-endian field runs
		// up from its start bit. Frames with big-endian fields are left to the unit tests of the grid.
		const little = (s: { byteOrder?: string }) => (s.byteOrder ?? 'little') === 'little';
		if (!frame.signals.every(little)) continue;
		const bit = frame.signals[0].startBit;
		// Where signals share a bit (multiplexed pages), the picture names the last one.
		const top = frame.signals.findLast((s) => bit >= s.startBit && bit < s.startBit + s.length)!;
		const row = layout.getByRole('row').nth(Math.floor(bit / 8) + 1);
		const cell = row.getByRole('cell').nth(7 - (bit % 8));
		await expect(cell).toContainText(`${top.name} bit ${bit - top.startBit}`);
		if (top.startBit === bit) await expect(cell).toContainText('LSB');
	}
	await page.emulateMedia({ media: 'screen' });
	await expect(page.getByRole('banner')).toBeVisible();
}

test('the printed reference sheet has no site chrome and draws every frame’s bit layout', async ({
	page,
	browser
}) => {
	await signIn(page, 'calibrator@framewright.test');
	await page.goto(`/w/${DEMO_SLUG}/maps`);
	await page.getByRole('link', { name: fixture.name, exact: true }).click();
	await expect(page.getByRole('heading', { level: 1, name: fixture.name })).toBeVisible();
	const mapPath = new URL(page.url()).pathname;
	await page.goto(`${mapPath}/sheet?rev=1`);
	await expectPrintedSheet(page);

	// The share link's sheet prints the same way, for someone not signed in.
	await page.goto(mapPath);
	await page.getByRole('combobox', { name: 'Revision', exact: true }).selectOption('r1');
	await page.getByRole('button', { name: 'Create share link' }).click();
	const shareUrl = await page.getByLabel(/New share link/).inputValue();
	const stranger = await (await browser.newContext()).newPage();
	await stranger.goto(`${shareUrl}/sheet`);
	await expectPrintedSheet(stranger);
});
