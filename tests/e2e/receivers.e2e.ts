/**
 * The receiver journey: an editor imports a dash display's profile, links it to a map revision
 * (automatically, then one channel by hand), publishes, reviews what a new map revision breaks and
 * moves to it, checks the profile on the demo capture, downloads the receive set and opens the
 * install sheet. Expected values come from the fixture files read here and from NIST SP 811, never
 * from the app's own linking or decoding.
 */
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { receiveSetSchema } from '../../src/lib/can/receivers/receive-set-schema';
import { readFixtureRows } from './fixture-rows';
import { signIn } from './helpers';

// Demo seed (demo mode, empty database): the calibrator edits this workspace, which holds the
// processed demo capture club-racer-session.csv.
const slug = 'quillmoor-club-racing';
const EDITOR = 'calibrator@framewright.test';
const api = `/api/workspaces/${slug}`;

const clubMap = JSON.parse(readFileSync('fixtures/club-racer-ecu.map.json', 'utf8'));
const dashProfile = JSON.parse(readFileSync('fixtures/dash-display.profile.json', 'utf8'));

/** Fails when the page is wider than the window (sideways scroll). */
async function expectNoSidewaysScroll(page: Page) {
	const widths = await page.evaluate(() => ({
		page: document.documentElement.scrollWidth,
		window: window.innerWidth
	}));
	expect(widths.page, 'page wider than a 390 px phone').toBeLessThanOrEqual(widths.window);
}

/** Saves the map draft and publishes it through the API (the map editor has its own journeys). */
async function publishMap(page: Page, mapId: string, draft: unknown, note: string) {
	const view = await (await page.request.get(`${api}/maps/${mapId}`)).json();
	let version: number = view.map.version;
	if (draft) {
		const saved = await page.request.put(`${api}/maps/${mapId}/draft`, {
			data: { version, draft }
		});
		expect(saved.status(), await saved.text()).toBe(200);
		version = (await saved.json()).version;
	}
	const published = await page.request.post(`${api}/maps/${mapId}/revisions`, {
		data: { note, version }
	});
	expect(published.status(), await published.text()).toBe(201);
}

test('an editor links a dash profile, relinks it to a new map revision, checks it on a capture and downloads its receive set and install sheet', async ({
	page
}) => {
	test.setTimeout(180_000);
	const run = Date.now().toString(36);
	const mapName = `Dash test controller ${run}`;
	const profileName = `Dash display ${run}`;
	await signIn(page, EDITOR);

	// ---- A map of our own in the demo workspace (a copy of the club racer fixture), published as r1. ----
	const created = await page.request.post(`${api}/maps`, {
		data: { name: mapName, mapJson: JSON.stringify({ ...clubMap, name: mapName }) }
	});
	expect(created.status(), await created.text()).toBe(201);
	const mapId: string = (await created.json()).map.id;
	await publishMap(page, mapId, null, 'The club racer fixture.');

	// ---- The editor imports the profile (without its hand-made link) and links it. ----
	await page.goto(`/w/${slug}/receivers`);
	const profileFile = { ...dashProfile, name: profileName, manualLinks: [] };
	await page.getByLabel('Import a profile file').setInputFiles({
		name: 'dash.profile.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify(profileFile))
	});
	await page.getByRole('button', { name: 'Import profile' }).click();
	await expect(page.getByRole('heading', { level: 1, name: profileName })).toBeVisible();
	const profileUrl = new URL(page.url()).pathname;
	const wantedCount = dashProfile.wanted.length;

	await page.getByLabel('Map', { exact: true }).selectOption({ label: mapName });
	await page.getByLabel('Revision', { exact: true }).selectOption({ label: 'r1' });
	await page.getByRole('button', { name: 'Link to this revision' }).click();
	await expect(page.getByText(`Linked to ${mapName} r1`)).toBeVisible();
	await page.getByRole('button', { name: 'Link automatically' }).click();
	// Most channels link by name and unit; the knock count (no unit, no name match) and the tank
	// sender's fuel level (not on this bus) stay unlinked.
	await expect(
		page.getByText(`${wantedCount - 2} of ${wantedCount} wanted channels linked.`)
	).toBeVisible();
	const links = page.getByRole('table', { name: 'Links' });
	const row = (name: string) => links.getByTestId('link-row').filter({ hasText: name });
	await expect(row('Oil pressure')).toContainText('Pressures · OilPressure');
	await expect(row('Oil pressure')).toContainText('kPa → bar');
	await expect(row('Det count')).toContainText('unlinked');

	// Fixed by hand, from the keyboard: the picker opens on Enter and links on Enter.
	await page.getByRole('button', { name: 'Pick a signal for Det count' }).focus();
	await page.keyboard.press('Enter');
	const picker = page.getByRole('dialog', { name: 'Link Det count by hand' });
	await expect(picker).toBeVisible();
	await picker.getByLabel('Frame').selectOption('Pressures');
	await picker.getByLabel('Signal').selectOption('KnockLevel');
	await picker.getByRole('button', { name: 'Link', exact: true }).focus();
	await page.keyboard.press('Enter');
	await expect(picker).toBeHidden();
	await expect(row('Det count')).toContainText('Pressures · KnockLevel');
	await expect(row('Det count')).toContainText('by hand');
	await expect(
		page.getByText(`${wantedCount - 1} of ${wantedCount} wanted channels linked.`)
	).toBeVisible();

	// Device alerts use the same rule table as map rules: a refused setpoint says why, changes nothing.
	const deviceRules = page.getByRole('table', { name: 'Device alerts' });
	const firstSetpoint = deviceRules.getByLabel(/^Device rule 1 (setpoint|band low)$/);
	const setpointBefore = await firstSetpoint.inputValue();
	await firstSetpoint.fill('hot');
	await firstSetpoint.press('Tab');
	await expect(deviceRules.getByText('Not applied: "hot" is not a number')).toBeVisible();
	await firstSetpoint.fill(setpointBefore);
	await firstSetpoint.press('Tab');
	await expect(deviceRules.getByText(/Not applied/)).toHaveCount(0);

	await page.getByRole('button', { name: 'Save draft' }).click();
	await expect(page.getByText('All changes saved')).toBeVisible();
	await page.getByRole('button', { name: 'Publish…' }).click();
	await page.getByLabel('Revision note').fill('Fitted to the test controller r1.');
	await page.getByRole('button', { name: 'Publish r1' }).click();
	await expect(page.getByText('Published r1.')).toBeVisible();

	// ---- r2 of the map renames the oil pressure signal and rescales coolant. ----
	const r2 = structuredClone(clubMap);
	r2.name = mapName;
	for (const frame of r2.frames)
		for (const signal of frame.signals) {
			if (signal.name === 'OilPressure') signal.name = 'EngineOilPressure';
			if (signal.name === 'CoolantTemp') signal.scale = 0.5;
		}
	for (const rule of r2.alertRules ?? [])
		if (rule.channel.signal === 'OilPressure') rule.channel.signal = 'EngineOilPressure';
	await publishMap(page, mapId, r2, 'Oil pressure renamed; coolant at 0.5 °C per bit.');

	// From here on a 390 px phone: no page may scroll sideways (wide tables scroll in their frame).
	await page.setViewportSize({ width: 390, height: 844 });
	await page.goto(profileUrl);
	await page.getByRole('link', { name: 'Review what r2 keeps, breaks and changes' }).click();
	await expect(
		page.getByRole('heading', { level: 1, name: `Relink to ${mapName} r2` })
	).toBeVisible();
	const broken = page.getByTestId('relink-broken');
	await expect(broken).toHaveCount(1);
	await expect(broken).toContainText('Oil pressure');
	await expect(broken.getByRole('checkbox', { name: /EngineOilPressure/ })).toBeChecked();
	const changed = page.getByTestId('relink-changed');
	await expect(changed).toHaveCount(1);
	await expect(changed).toContainText('ECT');
	await expect(changed.getByRole('row', { name: /scale/ })).toContainText('0.5');
	await expectNoSidewaysScroll(page);
	await page.getByRole('button', { name: 'Move the links to r2' }).click();

	await expect(page.getByText('Moved to r2')).toBeVisible();
	await expect(page.getByText(`Linked to ${mapName} r2`)).toBeVisible();
	await expect(row('Oil pressure')).toContainText('Pressures · EngineOilPressure');
	await expectNoSidewaysScroll(page);
	await page.getByRole('button', { name: 'Publish…' }).click();
	await page.getByLabel('Revision note').fill('Moved to the test controller r2.');
	await page.getByRole('button', { name: 'Publish r2' }).click();
	await expect(page.getByText('Published r2.')).toBeVisible();

	// ---- What changed between the profile's revisions. ----
	await page.goto(`${profileUrl}/diff?from=1&to=2`);
	await expect(
		page.getByRole('heading', { level: 1, name: 'Changes from r1 to r2' })
	).toBeVisible();
	await expect(
		page.getByRole('listitem').filter({ hasText: /Changed\s*link of\s*Oil pressure/ })
	).toContainText('EngineOilPressure');
	await expectNoSidewaysScroll(page);

	// ---- The installer's checklist on the demo capture, from the keyboard. ----
	await page.goto(`${profileUrl}/check?rev=2`);
	await expect(page.getByRole('heading', { level: 1, name: 'Check on a capture' })).toBeVisible();
	const captureSelect = page.getByLabel('Capture');
	const demoCapture = await captureSelect
		.locator('option', { hasText: 'club-racer-session.csv' })
		.first()
		.getAttribute('value');
	await captureSelect.focus();
	await captureSelect.selectOption(demoCapture!);
	await page.keyboard.press('Tab'); // the profile revision
	await page.keyboard.press('Tab'); // the Check button
	await page.keyboard.press('Enter');
	const checklist = page.getByRole('list', { name: 'Checklist' });
	await expect(checklist).toBeVisible({ timeout: 30_000 });
	await expect(checklist.getByTestId('check-channel')).toHaveCount(wantedCount);
	// RPM has one sample per EngineCore (0x5F0) frame of the CSV, counted here by hand.
	const engineCoreId = Number.parseInt(
		clubMap.frames.find((f: { name: string }) => f.name === 'EngineCore').id,
		16
	);
	const rpmSamples = readFixtureRows('fixtures/club-racer-session.csv').filter(
		(r) => r.id === engineCoreId
	).length;
	expect(rpmSamples).toBeGreaterThan(0);
	await expect(checklist).toContainText(`RPM arrives: ${rpmSamples} samples`);
	await expect(
		checklist.getByTestId('check-channel').filter({ hasText: 'Fuel level is not linked' })
	).toBeVisible();
	await expectNoSidewaysScroll(page);
	// The profile's device alerts replayed over the same capture (the shared replay panel).
	const deviceReplay = page.getByRole('region', { name: 'Device alerts on this capture' });
	await expect(
		deviceReplay.getByText(
			new RegExp(`^\\d+ alert events? from ${dashProfile.alertRules.length} rules?\\.`)
		)
	).toBeVisible();

	// ---- The receive set of r2, validated with the library's schema. ----
	await page.goto(profileUrl);
	const history = page.getByRole('list', { name: 'Revision history' });
	const r2Entry = history.getByRole('listitem').filter({ hasText: 'r2' });
	const downloading = page.waitForEvent('download');
	await r2Entry.getByRole('link', { name: 'Receive set' }).click();
	const download = await downloading;
	const file = readFileSync((await download.path())!, 'utf8');
	const receiveSet = receiveSetSchema.parse(JSON.parse(file));
	expect(receiveSet).toMatchObject({ profile: profileName, map: mapName, revision: 2 });
	expect(receiveSet.bitrate).toBe(clubMap.bitrate);
	const oil = receiveSet.channels.find((c) => c.name === 'Oil pressure')!;
	expect(oil.signal).toBe('EngineOilPressure');
	// 0.1 kPa per bit in the map; 1 bar = 100 kPa (NIST SP 811, Appendix B.8): 0.001 bar per bit.
	expect(oil.scale).toBeCloseTo(0.1 / 100, 12);
	expect(receiveSet.unlinked).toEqual([{ name: 'Fuel level', required: false }]);

	// ---- The printable install sheet of r2. ----
	await r2Entry.getByRole('link', { name: 'Install sheet' }).click();
	await expect(page.getByRole('heading', { level: 1, name: /^Install sheet:/ })).toBeVisible();
	await expect(page.getByText(`${clubMap.bitrate / 1000} kbit/s`).first()).toBeVisible();
	// The wiring cautions (SafetyNote) and the termination advice beside the bit rate.
	const caution = page.getByRole('complementary', { name: 'Caution' });
	await expect(caution).toContainText('Disconnect the battery');
	await expect(caution).toContainText('vehicle maker’s documentation');
	await expect(page.getByRole('region', { name: 'Before connecting' })).toContainText(
		'120 Ω terminator at each end'
	);
	const channels = page.getByRole('table', { name: /^Channels of/ });
	await expect(channels.getByRole('row', { name: /Oil pressure/ })).toContainText(
		'EngineOilPressure'
	);
	await expect(page.getByRole('table', { name: /^Device alerts of/ })).toContainText(
		'Oil pressure low'
	);
	await expectNoSidewaysScroll(page);
	// On paper: no site header or footer, no sheet buttons.
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('button', { name: 'Print or save as PDF' })).toBeHidden();
	await expect(page.getByRole('button', { name: /account menu/i })).toBeHidden();
	await expect(channels).toBeVisible();
});
