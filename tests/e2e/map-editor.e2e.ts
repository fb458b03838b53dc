import { expect, test, type Locator, type Page } from '@playwright/test';
import { createBlankMap, signIn } from './helpers';

// The demo seed (demo mode, empty database) makes these accounts members of this workspace.
const WORKSPACE = 'quillmoor-club-racing';
const EDITOR = 'calibrator@framewright.test';
const VIEWER = 'tuner@framewright.test';

const bit = (page: Page, byte: number, bitInByte: number): Locator =>
	page
		.getByRole('grid', { name: 'Bit layout' })
		.getByRole('gridcell', { name: new RegExp(`^Byte ${byte} bit ${bitInByte}:`) });

/** Drags across the bit grid the way a person does with a mouse. */
async function dragAcross(page: Page, from: Locator, to: Locator): Promise<void> {
	await from.hover();
	await page.mouse.down();
	const box = await to.boundingBox();
	if (!box) throw new Error('drag target is not visible');
	await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2, { steps: 8 });
	await page.mouse.up();
}

/** Places a big-endian 16-bit signal over two bytes and names and scales it in the signal details. */
async function placeSignal(
	page: Page,
	firstByte: number,
	name: string,
	scale: string
): Promise<void> {
	// With a signal selected a drag moves it; with none selected it places a new one.
	await page.getByLabel('Selected signal').selectOption('');
	await page.getByLabel('Drag places new signals as').selectOption('big');
	await dragAcross(page, bit(page, firstByte, 7), bit(page, firstByte + 1, 0));
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByLabel('Scale').fill(scale);
	await expect(
		page
			.getByRole('table', { name: 'Signals' })
			.getByRole('button', { name: `Select signal ${name}` })
	).toBeVisible();
}

async function saveFramePage(page: Page): Promise<void> {
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByText('Draft saved.')).toBeVisible();
}

async function publish(page: Page, number: number, note: string): Promise<void> {
	await page.getByRole('button', { name: 'Publish…' }).click();
	const dialog = page.getByRole('dialog', { name: `Publish r${number}` });
	await dialog.getByLabel('Revision note').fill(note);
	await dialog.getByRole('button', { name: `Publish r${number}` }).click();
	await expect(page.getByText(`Published r${number}.`)).toBeVisible();
	await expect(
		page.getByRole('list', { name: 'Revision history' }).getByRole('link', { name: `r${number}` })
	).toBeVisible();
}

test('an editor builds, lints, publishes and diffs a map; a viewer reads it; a share link works until revoked', async ({
	browser
}) => {
	test.setTimeout(180_000); // one long journey through several pages and three browser contexts
	const mapName = `Bench ECU ${Date.now().toString(36)}`;
	const editorContext = await browser.newContext();
	const editor = await editorContext.newPage();
	await signIn(editor, EDITOR);

	// Create a blank map from the maps list.
	const mapPath = await createBlankMap(editor, WORKSPACE, mapName);

	// Add a frame in the frames table and edit it with the keyboard only.
	await editor.getByRole('button', { name: 'Add frame' }).click();
	await editor.getByLabel('Name of Frame_1', { exact: true }).fill('EngineStatus');
	await editor.keyboard.press('Enter');
	await editor.keyboard.press('Home'); // the CAN ID column
	await editor.keyboard.press('Enter');
	await editor.getByLabel('CAN ID of EngineStatus', { exact: true }).fill('360');
	await editor.keyboard.press('Enter');
	for (let i = 0; i < 4; i++) await editor.keyboard.press('ArrowRight'); // → Cycle (ms)
	await editor.keyboard.press('Enter');
	await editor.getByLabel('Cycle (ms) of EngineStatus', { exact: true }).fill('20');
	await editor.keyboard.press('Escape'); // Escape drops the edit…
	await expect(
		editor.getByRole('gridcell', { name: 'Cycle (ms) of EngineStatus: empty' })
	).toBeVisible();
	await editor.keyboard.press('Enter'); // …Enter edits again and commits
	await editor.getByLabel('Cycle (ms) of EngineStatus', { exact: true }).fill('20');
	await editor.keyboard.press('Enter');
	const frames = editor.getByRole('grid', { name: 'Frames' });
	await expect(
		frames.getByRole('gridcell', { name: 'CAN ID of EngineStatus: 0x360' })
	).toBeVisible();
	await expect(
		frames.getByRole('gridcell', { name: 'Cycle (ms) of EngineStatus: 20' })
	).toBeVisible();
	// A value the map schema refuses is explained and not applied.
	await editor.keyboard.press('ArrowLeft'); // Length (bytes)
	await editor.keyboard.press('Enter');
	await editor.getByLabel('Length (bytes) of EngineStatus', { exact: true }).fill('9');
	await editor.keyboard.press('Enter');
	await expect(editor.getByRole('alert')).toContainText(
		'payload length must be 0–8, 12, 16, 20, 24, 32, 48 or 64 bytes'
	);
	await editor.keyboard.press('Escape');
	await expect(
		frames.getByRole('gridcell', { name: 'Length (bytes) of EngineStatus: 8' })
	).toBeVisible();
	await editor.getByRole('button', { name: 'Save draft' }).click();
	await expect(editor.getByText('Draft saved.')).toBeVisible();

	// Signals go in on the frame page: two 16-bit big-endian fields placed by dragging on the bit grid.
	await editor.getByRole('link', { name: 'Open frame EngineStatus: 0 signals' }).click();
	await expect(editor.getByRole('heading', { level: 1, name: 'Frame EngineStatus' })).toBeVisible();
	await placeSignal(editor, 2, 'Boost', '0.25'); // bytes 2–3: docs/bit-numbering.md, start bit 8·(2+2−1) = 24
	await placeSignal(editor, 0, 'OilPressure', '0.1'); // bytes 0–1: start bit 8
	await editor.getByRole('button', { name: 'Select signal Boost' }).click();
	await editor.getByRole('grid', { name: 'Bit layout' }).focus();
	await editor.keyboard.press('ArrowUp'); // Boost moves up a byte, onto OilPressure's byte 1
	await expect(editor.getByLabel('Start bit')).toHaveValue('16');
	await saveFramePage(editor);

	// The map page's live lint catches the overlap and publishing waits for it.
	await editor.goto(mapPath);
	const lintPanel = editor.getByRole('region', { name: 'Lint' });
	await expect(lintPanel).toContainText('1 error');
	await expect(lintPanel).toContainText('overlaps');
	await expect(frames.getByText('1 error')).toBeVisible();
	await expect(editor.getByRole('button', { name: 'Publish…' })).toBeDisabled();
	await expect(editor.getByText('Fix the 1 lint error before publishing.')).toBeVisible();

	// Fix it from the lint panel's link: back down a byte.
	await lintPanel.getByRole('link', { name: 'Fix in frame EngineStatus' }).click();
	await editor.getByRole('button', { name: 'Select signal Boost' }).click();
	await editor.getByRole('grid', { name: 'Bit layout' }).focus();
	await editor.keyboard.press('ArrowDown');
	await expect(editor.getByLabel('Start bit')).toHaveValue('24');
	await expect(editor.getByText('No lint problems in this frame.')).toBeVisible();

	// Test payload: big-endian means the first byte is the most significant (docs/bit-numbering.md).
	await editor.getByLabel('Payload (hex)').fill('01 F4 12 34 00 00 00 00');
	await expect(editor.getByLabel('Raw value of Boost')).toHaveText(String(0x1234));
	await expect(editor.getByLabel('Physical value of Boost')).toHaveText(String(0x1234 * 0.25));
	await expect(editor.getByLabel('Raw value of OilPressure')).toHaveText(String(0x01f4));
	await expect(editor.getByLabel('Physical value of OilPressure')).toHaveText('50');
	await saveFramePage(editor);

	// Publish r1.
	await editor.goto(mapPath);
	await expect(editor.getByRole('region', { name: 'Lint' })).toContainText('No problems');
	await publish(editor, 1, 'First bench map: engine status frame with boost and oil pressure.');

	// Change Boost's scale and publish r2.
	await editor.getByRole('link', { name: 'Open frame EngineStatus: 2 signals' }).click();
	await editor.getByRole('button', { name: 'Select signal Boost' }).click();
	await editor.getByLabel('Scale').fill('0.5');
	await saveFramePage(editor);
	await editor.goto(mapPath);
	await publish(editor, 2, 'Boost scale corrected to 0.5 kPa/bit.');

	// The comparison defaults to the previous revision against the latest.
	await editor.getByRole('button', { name: 'Show differences' }).click();
	await expect(
		editor.getByRole('heading', { level: 1, name: 'Changes from r1 to r2' })
	).toBeVisible();
	const boostChanges = editor.getByRole('list', { name: 'Signal differences in EngineStatus' });
	await expect(boostChanges).toContainText('Changed signal Boost');
	const scaleRow = boostChanges.getByRole('row', { name: /^scale/ });
	await expect(scaleRow.getByRole('cell').nth(0)).toHaveText('0.25');
	await expect(scaleRow.getByRole('cell').nth(1)).toHaveText('0.5');
	await expect(boostChanges).not.toContainText('OilPressure');

	// A share link to r2.
	await editor.goto(mapPath);
	await editor.getByRole('combobox', { name: 'Revision', exact: true }).selectOption('r2');
	await editor.getByRole('button', { name: 'Create share link' }).click();
	const shareUrl = await editor.getByLabel(/New share link/).inputValue();
	expect(shareUrl).toMatch(/\/s\/[^/]+$/);

	// The viewer opens r2 and finds no edit controls there or on the map page.
	const viewerContext = await browser.newContext();
	const viewer = await viewerContext.newPage();
	await signIn(viewer, VIEWER);
	await viewer.goto(`${mapPath}/revisions/2`);
	await expect(viewer.getByRole('heading', { level: 1, name: `${mapName} — r2` })).toBeVisible();
	await expect(viewer.getByText('Boost scale corrected')).toBeVisible();
	await expect(viewer.getByRole('table', { name: 'Signals of EngineStatus' })).toContainText('0.5');
	await expect(viewer.getByRole('main').getByRole('button')).toHaveCount(0); // nothing to edit or press
	// The one text box is the C code prefix: it names the downloaded files and edits nothing.
	await expect(viewer.getByRole('main').getByRole('textbox')).toHaveCount(1);
	await expect(viewer.getByRole('main').getByRole('textbox', { name: 'Prefix' })).toHaveValue('fw');
	await viewer.goto(mapPath);
	await expect(viewer.getByText('Read only: your role here is Viewer.')).toBeVisible();
	await expect(viewer.getByRole('table', { name: 'Frames' })).toContainText('EngineStatus');
	for (const name of [
		'Add frame',
		'Save draft',
		'Publish…',
		'Create share link',
		/^Restore/,
		/^Delete frame/
	]) {
		await expect(viewer.getByRole('button', { name })).toHaveCount(0);
	}
	await expect(viewer.getByRole('grid', { name: 'Frames' })).toHaveCount(0);

	// Signed out, the share link shows r2; once revoked it stops working.
	const strangerContext = await browser.newContext();
	const stranger = await strangerContext.newPage();
	await stranger.goto(shareUrl);
	await expect(stranger.getByText(mapName).first()).toBeVisible();
	await expect(stranger.getByText(/r2/).first()).toBeVisible();
	await editor.getByRole('button', { name: 'Revoke link to r2' }).click();
	await expect(editor.getByRole('list', { name: 'Existing share links' })).toContainText('revoked');
	const afterRevoke = await stranger.goto(shareUrl);
	expect(afterRevoke?.status()).toBe(404);
	await expect(stranger.getByText('This link was revoked or has expired')).toBeVisible();

	await Promise.all([editorContext.close(), viewerContext.close(), strangerContext.close()]);
});
