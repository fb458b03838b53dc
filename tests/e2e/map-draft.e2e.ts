import { expect, test } from '@playwright/test';
import { createBlankMap, signIn } from './helpers';

// Demo seed accounts (demo mode, empty database): members of this workspace.
const WORKSPACE = 'quillmoor-club-racing';
const EDITOR = 'calibrator@framewright.test';

test('the map page keeps unsaved edits safe: undo, a save refused as stale then reloaded, the question before leaving', async ({
	page
}) => {
	await signIn(page, EDITOR);
	const mapPath = await createBlankMap(page, WORKSPACE, `Dash node ${Date.now().toString(36)}`);
	const mapId = mapPath.split('/').pop();
	const newFrameLink = page.getByRole('link', { name: 'Open frame Frame_1: 0 signals' });
	const addFrame = async () => {
		await page.getByRole('button', { name: 'Add frame' }).click();
		await page.keyboard.press('Escape'); // leave the name as proposed
		await expect(newFrameLink).toBeVisible();
	};

	// Undo takes back the last edit and, with nothing else changed, the draft is clean again.
	await addFrame();
	await expect(page.getByText('Changed new frame Frame_1.')).toBeVisible();
	await expect(page.getByText('Unsaved changes')).toBeVisible();
	await page.getByRole('button', { name: 'Undo' }).click();
	await expect(newFrameLink).toHaveCount(0);
	await expect(page.getByText('All changes saved')).toBeVisible();

	// Someone else saves first: this save is refused, the edit stays on screen until Reload.
	await addFrame();
	const current = await (
		await page.request.get(`/api/workspaces/${WORKSPACE}/maps/${mapId}`)
	).json();
	const other = await page.request.put(`/api/workspaces/${WORKSPACE}/maps/${mapId}/draft`, {
		data: { version: current.map.version, draft: { ...current.map.draft, bitrate: 250_000 } }
	});
	expect(other.status()).toBe(200);
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByRole('alert')).toContainText('Not saved: someone else changed this map');
	await expect(newFrameLink).toBeVisible();
	await page.getByRole('button', { name: 'Reload (discards your unsaved edits)' }).click();
	await expect(page.getByText('Reloaded the latest saved draft.')).toBeVisible();
	await expect(page.getByText('· 250 kbit/s')).toBeVisible(); // their change
	await expect(newFrameLink).toHaveCount(0); // ours is gone, as the button said
	await expect(page.getByText('All changes saved')).toBeVisible();

	// Leaving with unsaved edits asks first: "stay" keeps them, "leave" goes.
	await addFrame();
	const breadcrumb = page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', {
		name: 'Maps'
	});
	let question = '';
	page.once('dialog', (dialog) => {
		question = dialog.message();
		return dialog.dismiss();
	});
	await breadcrumb.click();
	await expect.poll(() => question).toContain('unsaved changes');
	await expect(page).toHaveURL(new RegExp(`${mapPath}$`));
	await expect(newFrameLink).toBeVisible();
	page.once('dialog', (dialog) => dialog.accept());
	await breadcrumb.click();
	await expect(page).toHaveURL(new RegExp(`/w/${WORKSPACE}/maps$`));
});
