import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { mapBusLoad } from '../../src/lib/can/busload';
import { parseMap } from '../../src/lib/can/map-json';
import { signIn } from './helpers';

// The demo seed (demo mode, empty database) makes the tuner a viewer of this workspace and
// publishes the club racer fixture (invented demo data) as r1 of "Club racer engine controller".
const WORKSPACE = 'quillmoor-club-racing';
const VIEWER = 'tuner@framewright.test';
const DEMO_MAP = 'Club racer engine controller';

test('a viewer computes a bit timing, sees a map revision’s bus load and opens the wiring checklist', async ({
	page
}) => {
	await signIn(page, VIEWER);
	await page.goto(`/w/${WORKSPACE}/tools`);
	await expect(page.getByRole('heading', { level: 1, name: 'Tools' })).toBeVisible();
	// Sources and how far to trust them are on a notes page of their own, not in the tools' wording.
	await expect(page.getByRole('main')).not.toContainText('from memory');
	await page.getByRole('link', { name: 'notes on sources and caveats' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Sources and caveats' })).toBeVisible();
	await expect(page.getByRole('main')).toContainText('ISO 11898-1');
	await page.goto(`/w/${WORKSPACE}/tools`);

	// Bit timing, by keyboard and presets: 16 MHz, 500 kbit/s, 87.5 %.
	const calculator = page.getByRole('region', { name: 'Bit-timing calculator' });
	await calculator.getByRole('button', { name: '16 MHz' }).click();
	await calculator.getByRole('button', { name: '500 kbit/s' }).click();
	await calculator.getByLabel('Wanted sample point (%)').fill('87.5');
	await calculator.getByLabel('Wanted sample point (%)').press('Enter');
	const settings = calculator.getByRole('table', { name: 'Bit-timing settings' });
	// ISO 11898-1 arithmetic: 16 MHz / (2 × 16 tq) = 500 kbit/s; sample point (1 + 13) / 16 = 87.5 %.
	const first = settings.getByRole('row').nth(1).getByRole('cell');
	await expect(first.nth(1)).toHaveText('2');
	await expect(first.nth(2)).toHaveText('16');
	await expect(first.nth(3)).toHaveText('1 + 13 + 2');
	await expect(first.nth(7)).toHaveText('87.5 %');
	await expect(first.nth(8)).toHaveText('0 %');
	await expect(calculator.getByText('16 MHz / (2 × 16 tq) = 500 kbit/s')).toBeVisible();

	// A nonsense clock is refused with a message next to the field, not a table.
	await calculator.getByLabel('Controller clock (Hz)').fill('16 MHz');
	await calculator.getByRole('button', { name: 'Calculate settings' }).click();
	await expect(
		calculator.getByText('The controller clock must be a plain number, like 16000000.')
	).toBeVisible();
	await expect(settings).toHaveCount(0);

	// Bus load of the demo map's r1, checked against the core computing over the same fixture.
	const fixture = parseMap(
		readFileSync(new URL('../../fixtures/club-racer-ecu.map.json', import.meta.url), 'utf8')
	);
	if (!fixture.ok) throw new Error('the club racer fixture must parse');
	const expected = mapBusLoad(fixture.map);
	const busLoad = page.getByRole('region', { name: 'Bus load of a map' });
	await busLoad.getByLabel('Map').selectOption({ label: DEMO_MAP });
	await busLoad.getByLabel('Revision').selectOption({ label: 'r1' });
	await busLoad.getByRole('button', { name: 'Show bus load' }).click();
	await expect(busLoad.getByTestId('nominal-total')).toHaveText(
		`${expected.nominalPercent.toFixed(2)} %`
	);
	await expect(busLoad.getByTestId('worst-case-total')).toHaveText(
		`${expected.worstCasePercent.toFixed(2)} %`
	);
	await expect(busLoad.getByText('500 kbit/s')).toBeVisible();
	// Heaviest first: the first row is the frame with the largest worst-case contribution.
	const heaviest = [...expected.frames].sort(
		(a, b) => b.worstCaseBitsPerSecond - a.worstCaseBitsPerSecond
	)[0];
	await expect(
		busLoad
			.getByRole('table', { name: 'Load per frame' })
			.getByRole('row')
			.nth(1)
			.getByRole('rowheader')
	).toHaveText(heaviest.name);

	// A budget below the worst case warns; the default 50 % is called common practice.
	await expect(busLoad.getByText(/50 % is common practice/)).toBeVisible();
	const below = Math.max(0.1, Math.floor(expected.worstCasePercent / 2));
	await busLoad.getByLabel('Worst-case budget (%)').fill(String(below));
	await expect(busLoad.getByRole('alert')).toContainText(`exceeds the budget of ${below} %`);

	// The wiring checklist: rules of thumb marked, the cautions shown, printable.
	await page.getByRole('link', { name: 'Open the wiring checklist' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'CAN wiring checklist' })).toBeVisible();
	const checks = page.getByRole('list', { name: 'Checks' });
	await expect(checks.getByText('About 60 Ω across CAN-H and CAN-L, power off')).toBeVisible();
	await expect(checks.getByText('common practice').first()).toBeVisible();
	await expect(page.getByRole('complementary', { name: 'Caution' })).toContainText(
		'Disconnect the battery'
	);
	await page.getByLabel('Termination at each of the two ends').check();
	await expect(page.getByLabel('Termination at each of the two ends')).toBeChecked();
	await expect(page.getByRole('button', { name: 'Print or save as PDF' })).toBeVisible();
});
