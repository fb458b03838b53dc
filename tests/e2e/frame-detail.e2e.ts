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

async function setUp(page: Page, json = mapJson): Promise<{ slug: string; mapId: string }> {
	await signIn(page, uniqueEmail('calibrator'));
	await page.goto('/');
	await page.getByLabel('Workspace name').fill(`Frame bench ${Date.now().toString(36)}`);
	await page.getByRole('button', { name: 'Create workspace' }).click();
	await expect(page).toHaveURL(/\/w\/[^/]+\/maps$/);
	const slug = new URL(page.url()).pathname.split('/')[2];
	const created = await page.request.post(`/api/workspaces/${slug}/maps`, {
		data: { mapJson: json }
	});
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

/** Presses Tab (or Shift+Tab) until `target` has focus, as a keyboard user would; fails after 60. */
async function tabTo(page: Page, target: Locator, back = false): Promise<void> {
	for (let presses = 0; presses < 60; presses++) {
		if (await target.evaluate((el) => el === document.activeElement)) return;
		await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
	}
	throw new Error('Tab never reached the target');
}

/** Replaces a focused field's text and commits it with Enter. */
async function typeAndEnter(page: Page, text: string): Promise<void> {
	await page.keyboard.press('ControlOrMeta+A');
	await page.keyboard.type(text);
	await page.keyboard.press('Enter');
}

test('keyboard only: an editor switches an extended frame to J1939, edits its PGN, addresses and ID both ways, and an SPN', async ({
	page
}) => {
	// Invented for this test: a standard frame and an extended one not yet marked J1939.
	const json = JSON.stringify({
		format: 'framewright-map@1',
		name: 'J1939 editor test map',
		frames: [
			{ name: 'Dash', id: '0x360', length: 8, signals: [] },
			{
				name: 'EngineTemp',
				id: '0x18FEF100',
				extended: true,
				length: 8,
				signals: [{ name: 'CoolantTemp', startBit: 0, length: 8, offset: -40, unit: '°C' }]
			}
		]
	});
	const { slug, mapId } = await setUp(page, json);

	// A standard frame cannot be switched to J1939.
	await page.goto(`/w/${slug}/maps/${mapId}/frames/0`);
	await expect(page.getByRole('switch', { name: 'J1939' })).toBeDisabled();

	await page.goto(`/w/${slug}/maps/${mapId}/frames/1`);
	const id = page.getByLabel('CAN ID');
	const j1939 = page.getByRole('switch', { name: 'J1939' });
	const breakdown = page.getByTestId('j1939-breakdown');
	await tabTo(page, id);
	await page.keyboard.press('Tab');
	await expect(j1939).toBeFocused();
	await page.keyboard.press('Space');
	await expect(j1939).toBeChecked();

	// SAE J1939-21 layout of 0x18FEF100: priority 6 (bits 28–26), PF 0xFE ≥ 240 so PDU2 with
	// PS 0xF1 in the PGN (0xFEF1 = 65265), source address 0x00.
	await expect(page.getByLabel('Priority')).toHaveValue('6');
	await expect(page.getByLabel('PGN')).toHaveValue('0xFEF1');
	await expect(page.getByLabel('Source address')).toHaveValue('0x00');
	await expect(breakdown).toHaveText(/PGN 65265 = EDP 0 · DP 0 · PF 0xFE · PS 0xF1 \(PDU2/);

	// PGN 61444 (0xF004) typed in decimal: the ID keeps priority 6 and SA 0 → 0x18F00400.
	await page.keyboard.press('Tab'); // Priority
	await page.keyboard.press('Tab'); // PGN
	await expect(page.getByLabel('PGN')).toBeFocused();
	await typeAndEnter(page, '61444');
	await expect(id).toHaveValue('0x18F00400');
	await page.keyboard.press('Tab'); // Source address
	await typeAndEnter(page, '0x17');
	await expect(id).toHaveValue('0x18F00417');
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Frame EngineTemp');

	// PDU2 is broadcast: a destination is refused with the reason and the ID stays as it was.
	await page.keyboard.press('Tab'); // Destination address
	await typeAndEnter(page, '5');
	await expect(page.getByText(/PDU2 PGNs \(PF ≥ 240\) are broadcast/)).toBeVisible();
	await expect(id).toHaveValue('0x18F00417');
	await page.keyboard.press('Escape');
	await expect(page.getByLabel('Destination address')).toHaveValue('');

	// The other way: a typed ID splits into its parts. 0x0CEA2100 = priority 3, PF 0xEA < 240 (PDU1,
	// PGN 0xEA00), destination 0x21, source 0x00.
	await tabTo(page, id, true);
	await typeAndEnter(page, '0x0CEA2100');
	await expect(page.getByLabel('Priority')).toHaveValue('3');
	await expect(page.getByLabel('PGN')).toHaveValue('0xEA00');
	await expect(page.getByLabel('Destination address')).toHaveValue('0x21');
	await expect(page.getByLabel('Source address')).toHaveValue('0x00');
	await expect(breakdown).toHaveText(/PF 0xEA · PS 0x21 \(PDU1, destination address\)/);
	// A PDU1 PGN with a non-zero PS byte is refused: PS is the destination there.
	await tabTo(page, page.getByLabel('PGN'));
	await typeAndEnter(page, '0xEA12');
	await expect(page.getByText(/zero low byte/)).toBeVisible();
	await expect(id).toHaveValue('0x0CEA2100');
	await page.keyboard.press('Escape');

	// SPN of the signal: select it with the keyboard, Enter opens its details.
	await tabTo(page, page.getByRole('button', { name: 'Select signal CoolantTemp' }));
	await page.keyboard.press('Enter');
	const spn = page.getByLabel('SPN');
	await tabTo(page, spn);
	await page.keyboard.press('ControlOrMeta+A');
	await page.keyboard.type('600000');
	await expect(page.getByText('an SPN is a whole number 0…524287 (19 bits)')).toBeVisible();
	await page.keyboard.press('ControlOrMeta+A');
	await page.keyboard.type('110');
	await expect(page.getByText('an SPN is a whole number 0…524287 (19 bits)')).toHaveCount(0);

	// Save with the keyboard; the stored draft has the composed ID, the switch and the SPN.
	await tabTo(page, page.getByRole('button', { name: 'Save draft' }), true);
	await page.keyboard.press('Enter');
	await expect(page.getByText('Draft saved.')).toBeVisible();
	const saved = await (await page.request.get(`/api/workspaces/${slug}/maps/${mapId}`)).json();
	expect(saved.map.draft.frames[1]).toMatchObject({ id: 0x0cea2100, extended: true, j1939: true });
	expect(saved.map.draft.frames[1].signals[0].spn).toBe(110);
});
