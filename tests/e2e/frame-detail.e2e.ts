import { expect, test, type Locator, type Page } from '@playwright/test';
import { signIn, uniqueEmail } from './helpers';

// A one-frame map, invented for this test: OilPressure little-endian in bytes 0–1, 0.1 kPa/bit.
const mapJson = JSON.stringify({
	format: 'framewright-map@1',
	name: 'Frame detail test map',
	frames: [
		{
			name: 'EngineStatus',
			id: '0x360',
			length: 8,
			cycleMs: 20,
			signals: [
				{
					name: 'OilPressure',
					startBit: 0,
					length: 16,
					byteOrder: 'little',
					scale: 0.1,
					unit: 'kPa'
				}
			]
		}
	]
});

async function setUp(page: Page): Promise<{ slug: string; mapId: string }> {
	await signIn(page, uniqueEmail('calibrator'));
	await page.goto('/');
	await page.getByLabel('Workspace name').fill(`Frame bench ${Date.now().toString(36)}`);
	await page.getByRole('button', { name: 'Create workspace' }).click();
	await expect(page).toHaveURL(/\/w\/[^/]+\/maps$/);
	const slug = new URL(page.url()).pathname.split('/')[2];
	const created = await page.request.post(`/api/workspaces/${slug}/maps`, { data: { mapJson } });
	expect(created.status()).toBe(201);
	const { map } = await created.json();
	return { slug, mapId: map.id };
}

const cell = (page: Page, byte: number, bit: number): Locator =>
	page
		.getByRole('grid', { name: 'Bit layout' })
		.getByRole('gridcell', { name: new RegExp(`^Byte ${byte} bit ${bit}:`) });

/**
 * Drags like a person: both ends on screen. A pointer moved past the viewport's edge reaches no
 * element, so the grid would see the drag end on the last bit still on screen; scroll the target
 * into view first and refuse a drag whose end is still off screen.
 */
async function dragAcross(page: Page, from: Locator, to: Locator): Promise<void> {
	await to.scrollIntoViewIfNeeded();
	await from.hover();
	const [fromBox, box] = [await from.boundingBox(), await to.boundingBox()];
	const viewport = page.viewportSize();
	if (!fromBox || !box || !viewport) throw new Error('drag ends are not visible');
	for (const end of [fromBox, box]) {
		if (end.y < 0 || end.y + end.height > viewport.height)
			throw new Error('drag ends do not fit on screen together');
	}
	await page.mouse.down();
	await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2, { steps: 8 });
	await page.mouse.up();
}

test('an editor places, moves and resizes a signal on the bit grid, sees overlaps, and checks values in the test payload', async ({
	page
}) => {
	const { slug, mapId } = await setUp(page);
	await page.goto(`/w/${slug}/maps/${mapId}/frames/0`);
	await expect(page.getByRole('heading', { level: 1, name: 'Frame EngineStatus' })).toBeVisible();

	// Drag from byte 2 bit 7 (top left) to byte 3 bit 0 (bottom right) as big-endian: docs/bit-numbering.md says a
	// big-endian field filling bytes k … k+m−1 has startBit 8·(k+m−1) = 8·(2+2−1) = 24, 16 bits long.
	await page.getByLabel('Drag places new signals as').selectOption('big');
	await dragAcross(page, cell(page, 2, 7), cell(page, 3, 0));
	const signals = page.getByRole('table', { name: 'Signals' });
	const newRow = signals
		.getByRole('row')
		.filter({ has: page.getByRole('button', { name: 'Select signal Signal_2' }) });
	await expect(newRow.getByRole('cell').nth(0)).toHaveText('24');
	await expect(newRow.getByRole('cell').nth(1)).toHaveText('16');
	await expect(newRow.getByRole('cell').nth(2)).toHaveText('big');
	await expect(page.getByLabel('Start bit')).toHaveValue('24');
	await expect(cell(page, 3, 0)).toHaveAccessibleName(/Signal_2 bit 0 \(least significant bit\)/);

	// Name and scale it in the signal details.
	await page.getByLabel('Name', { exact: true }).fill('Boost');
	await page.getByLabel('Scale').fill('0.25');
	await page.getByLabel('Unit').fill('kPa');
	await expect(signals.getByRole('button', { name: 'Select signal Boost' })).toBeVisible();

	// Keyboard: ↑ moves the start bit up one byte, onto OilPressure's byte 1 — the overlap is flagged.
	const grid = page.getByRole('grid', { name: 'Bit layout' });
	await grid.focus();
	await page.keyboard.press('ArrowUp');
	await expect(page.getByLabel('Start bit')).toHaveValue('16');
	const layoutProblems = page.getByRole('list', { name: 'Layout problems' });
	await expect(layoutProblems).toContainText('Overlap: OilPressure and Boost');
	await expect(page.getByRole('list', { name: 'Lint problems in this frame' })).toContainText(
		'"Boost" overlaps "OilPressure"'
	);
	await expect(cell(page, 1, 0)).toHaveAccessibleName(/overlap$/);

	// ↓ moves it back; Shift+→ shortens and Shift+← lengthens by one bit.
	await page.keyboard.press('ArrowDown');
	await expect(page.getByLabel('Start bit')).toHaveValue('24');
	await expect(layoutProblems).toHaveCount(0);
	await expect(page.getByText('No lint problems in this frame.')).toBeVisible();
	await page.keyboard.press('Shift+ArrowRight');
	await expect(page.getByLabel('Length', { exact: true })).toHaveValue('15');
	await page.keyboard.press('Shift+ArrowLeft');
	await expect(page.getByLabel('Length', { exact: true })).toHaveValue('16');

	// Test payload: the expected values come from the map arithmetic (physical = raw × scale + offset).
	const payload = [0xe8, 0x03, 0x12, 0x34, 0, 0, 0, 0];
	await page.getByLabel('Payload (hex)').fill('E8 03 12 34 00 00 00 00');
	const oilRaw = payload[0] + payload[1] * 256; // little-endian: byte 0 is least significant
	const boostRaw = payload[2] * 256 + payload[3]; // big-endian: byte 2 is most significant
	await expect(page.getByLabel('Raw value of OilPressure')).toHaveText(String(oilRaw));
	await expect(page.getByLabel('Physical value of OilPressure')).toHaveText(String(oilRaw * 0.1));
	await expect(page.getByLabel('Raw value of Boost')).toHaveText(String(boostRaw));
	await expect(page.getByLabel('Physical value of Boost')).toHaveText(String(boostRaw * 0.25));

	// Encode 50 kPa into Boost: raw 50 / 0.25 = 200 = 0x00C8 in bytes 2–3, other bytes untouched.
	await page.getByLabel('Value to encode into Boost').fill('50');
	await page.getByRole('button', { name: 'Encode Boost' }).click();
	await expect(page.getByLabel('Encoded bytes')).toHaveText('E8 03 00 C8 00 00 00 00');
	await expect(page.getByLabel('Reads back as')).toHaveText('50');
	await expect(page.getByLabel('Payload (hex)')).toHaveValue('E8 03 00 C8 00 00 00 00');
	await expect(page.getByLabel('Physical value of Boost')).toHaveText('50');

	// Save, and the draft keeps the signal after a reload.
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByText('Draft saved.')).toBeVisible();
	await page.reload();
	await page.getByRole('button', { name: 'Select signal Boost' }).click();
	await expect(page.getByLabel('Start bit')).toHaveValue('24');
	await expect(page.getByLabel('Byte order')).toHaveValue('big');

	// Someone else saves first: this page's save is refused with a clear message, nothing overwritten.
	const current = await (await page.request.get(`/api/workspaces/${slug}/maps/${mapId}`)).json();
	const other = await page.request.put(`/api/workspaces/${slug}/maps/${mapId}/draft`, {
		data: {
			version: current.map.version,
			draft: { ...current.map.draft, name: 'Renamed elsewhere' }
		}
	});
	expect(other.status()).toBe(200);
	await page.getByLabel('Comment').fill('edited after someone else saved');
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByRole('alert')).toContainText('Someone else saved this map first');
	await expect(page.getByRole('alert')).toContainText('your edit was not saved');
	await page.getByRole('button', { name: 'Reload the map' }).click();
	await expect(page.getByText('All changes saved')).toBeVisible();

	// Lint links can open the frame with a signal selected.
	await page.goto(`/w/${slug}/maps/${mapId}/frames/0?signal=1`);
	await expect(page.getByRole('heading', { name: 'Signal details: Boost' })).toBeVisible();
	await expect(page.getByRole('button', { name: 'Select signal Boost' })).toHaveAttribute(
		'aria-pressed',
		'true'
	);
});
