import { expect, test } from '@playwright/test';
import { createBlankMap, signIn } from './helpers';

// Demo seed accounts (demo mode, empty database): members of this workspace.
const WORKSPACE = 'quillmoor-club-racing';
const OWNER = 'owner@framewright.test';
const EDITOR = 'calibrator@framewright.test';

test('an editor renames a map and sets its bit rate but cannot delete it; the owner deletes it', async ({
	browser
}) => {
	const mapName = `Gearbox node ${Date.now().toString(36)}`;
	const editorContext = await browser.newContext();
	const editor = await editorContext.newPage();
	await signIn(editor, EDITOR);
	const mapPath = await createBlankMap(editor, WORKSPACE, mapName);

	const settings = editor.getByRole('region', { name: 'Map settings' });
	await settings.getByLabel('Map name').fill(`${mapName} v2`);
	await settings.getByRole('button', { name: 'Rename' }).click();
	await expect(editor.getByRole('heading', { level: 1, name: `${mapName} v2` })).toBeVisible();

	// A bit rate outside the map format's range is refused with a reason next to the field; a valid
	// one is saved in the draft at once, and an unsaved edit made before stays unsaved.
	const bitrate = settings.getByLabel('Bit rate (bit/s)');
	await bitrate.fill('12');
	await bitrate.press('Enter');
	await expect(settings.getByText(/whole number of bit\/s/)).toBeVisible();
	await expect(bitrate).toHaveAttribute('aria-invalid', 'true');
	await editor.getByRole('button', { name: 'Add frame' }).click();
	await editor.keyboard.press('Escape'); // leave the proposed frame name
	await expect(editor.getByText('Unsaved changes')).toBeVisible();
	await bitrate.fill('250000');
	await settings.getByRole('button', { name: 'Set' }).click();
	await expect(editor.getByText('Bit rate set to 250 kbit/s.')).toBeVisible();
	await expect(editor.getByText('Unsaved changes')).toBeVisible();
	await expect(editor.getByText('· 250 kbit/s')).toBeVisible();
	await editor.getByRole('button', { name: 'Save draft' }).click();
	await expect(editor.getByText('Draft saved.')).toBeVisible();
	await editor.reload();
	await expect(settings.getByLabel('Bit rate (bit/s)')).toHaveValue('250000');
	await expect(editor.getByRole('heading', { level: 1, name: `${mapName} v2` })).toBeVisible();
	// Deleting is the owner's: the editor has no button, and the API refuses them.
	await expect(editor.getByRole('button', { name: 'Delete map…' })).toHaveCount(0);
	const mapId = mapPath.split('/').pop();
	const refused = await editor.request.delete(`/api/workspaces/${WORKSPACE}/maps/${mapId}`);
	expect(refused.status()).toBe(403);
	await editorContext.close();

	const ownerContext = await browser.newContext();
	const owner = await ownerContext.newPage();
	await signIn(owner, OWNER);
	await owner.goto(mapPath);
	await owner.getByRole('button', { name: 'Delete map…' }).click();
	await owner.getByRole('dialog').getByRole('button', { name: 'Delete the map' }).click();
	await expect(owner).toHaveURL(new RegExp(`/w/${WORKSPACE}/maps$`));
	await expect(owner.getByText(`${mapName} v2`)).toHaveCount(0);
	const gone = await owner.goto(mapPath);
	expect(gone?.status()).toBe(404);
	await ownerContext.close();
});
