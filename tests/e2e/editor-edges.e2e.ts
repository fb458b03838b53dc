/**
 * Rough edges of the map editor a calibrator met: a new map's bit rate is chosen (and a CSV signal
 * table says which it gets), a map file whose name is taken asks before importing, and "last saved"
 * follows a save.
 */
import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { DEMO_SLUG } from './capture-helpers';
import { signIn } from './helpers';

const clubRacer = JSON.parse(readFileSync('fixtures/club-racer-ecu.map.json', 'utf8')) as {
	name: string;
	frames: { name: string }[];
};
const mapsPath = `/w/${DEMO_SLUG}/maps`;
const unique = () => Date.now().toString(36);

test('a new map and a CSV signal table take the chosen bit rate; "last saved" follows a save', async ({
	page
}) => {
	await signIn(page, 'calibrator@framewright.test');
	await page.goto(mapsPath);
	const name = `Slow body bus ${unique()}`;
	await page.getByLabel('Map name').fill(name);
	await page.getByLabel('Bit rate', { exact: true }).selectOption({ label: '250 kbit/s' });
	await page.getByRole('button', { name: 'Create blank map' }).click();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
	const status = page.getByText(/· last saved/);
	await expect(status).toContainText('250 kbit/s');
	await expect(status).not.toContainText('by you');

	await page.getByRole('button', { name: 'Add frame' }).click();
	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByText('Draft saved.')).toBeVisible();
	await expect(status).toContainText('by you');

	// The table has no bit rate of its own: the panel says which the new map gets.
	await page.goto(mapsPath);
	await page.getByLabel('Bit rate of the new map').selectOption({ label: '125 kbit/s' });
	await page.getByLabel('Import a CSV signal table').setInputFiles({
		name: 'table.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(
			`frame_name,frame_id,signal_name,start_bit,bit_length\nDoorState,0x310,DriverDoor,0,1\n`
		)
	});
	await expect(page.getByText(/· last saved/)).toContainText('125 kbit/s');
});

test('importing a map file under a name in use asks first, then imports a copy or replaces the draft', async ({
	page
}) => {
	await signIn(page, 'calibrator@framewright.test');
	const file = (map: object) => ({
		name: 'map.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify(map))
	});
	const input = () => page.getByLabel('Import a map JSON file');
	const choice = () => page.getByLabel('If a map of that name exists');
	// A map of this journey's own, so the demo maps keep their names for other journeys.
	const own = `Body controller ${unique()}`;
	await page.goto(mapsPath);
	await page.getByLabel('Map name').fill(own);
	await page.getByRole('button', { name: 'Create blank map' }).click();
	await expect(page.getByRole('heading', { level: 1, name: own })).toBeVisible();
	const ownPath = new URL(page.url()).pathname;

	// Asked first (the default): nothing is created and the page says what to choose.
	await page.goto(mapsPath);
	await input().setInputFiles(file({ ...clubRacer, name: own }));
	await expect(page.getByText(`A map called “${own}” exists already.`).first()).toBeVisible();
	await page.goto(mapsPath);
	await expect(page.getByRole('link', { name: new RegExp(`^${own}`) })).toHaveCount(1);

	// As a copy: a new map under the first free "(copy)" name.
	await choice().selectOption({ label: 'Import as a new map named “… (copy)”' });
	await input().setInputFiles(file({ ...clubRacer, name: own }));
	await expect(page.getByRole('heading', { level: 1, name: `${own} (copy)` })).toBeVisible();

	// Replace (the name in other letter case is the same name): the existing map keeps its page and
	// revisions; its draft becomes the file.
	await page.goto(mapsPath);
	await choice().selectOption({ label: 'Replace the draft of that map (its revisions stay)' });
	await input().setInputFiles(file({ ...clubRacer, name: own.toUpperCase() }));
	await expect(page).toHaveURL(new RegExp(`${ownPath}$`));
	await expect(page.getByRole('heading', { level: 1, name: own, exact: true })).toBeVisible();
	const frames = page.getByRole('grid', { name: 'Frames' });
	for (const frame of clubRacer.frames) await expect(frames).toContainText(frame.name);
});
