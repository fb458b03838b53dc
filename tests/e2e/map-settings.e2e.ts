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

	// A bit rate outside the schema's range is refused with a reason; a valid one marks the draft unsaved.
	await settings.getByLabel('Bit rate (bit/s)').fill('12');
	await settings.getByLabel('Bit rate (bit/s)').press('Enter');
	await settings.getByLabel('Bit rate (bit/s)').blur();
	await expect(settings.getByText(/whole number of bit\/s/)).toBeVisible();
	await settings.getByLabel('Bit rate (bit/s)').fill('250000');
	await settings.getByLabel('Bit rate (bit/s)').blur();
	await expect(editor.getByText('Unsaved changes')).toBeVisible();
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
