/**
 * The capture workbench on the genset demo capture (J1939, 250 kbit/s): the plot stays in view while
 * the panels change, a view's link reopens the same window for someone else, and a derived channel
 * equals the same formula computed here from the fixture's bytes (DataView), independently of the
 * app's importer, decoder and formula evaluator.
 */
import { expect, test, type Page } from '@playwright/test';
import {
	decodeWithLatest,
	DEMO_SLUG,
	GENSET_CSV,
	plotChannel,
	uploadAndProcess
} from './capture-helpers';
import { readFixtureRows } from './fixture-rows';
import { signIn } from './helpers';

const rows = readFixtureRows(GENSET_CSV);
const t0 = rows[0].time;

const EEC1 = 0x0cf00400;
const ET1 = 0x18feee00;
// SAE J1939-71 (from memory): engine speed SPN 190, bytes 4–5 of EEC1, 0.125 rpm/bit little-endian;
// coolant temperature SPN 110, byte 1 of ET1, 1 °C/bit with −40 °C offset.
const engineSpeed = (view: DataView) => view.getUint16(3, true) * 0.125;
const coolantTemp = (view: DataView) => view.getUint8(0) - 40;

async function openDecoded(page: Page, who?: string): Promise<string> {
	if (who) await signIn(page, who);
	const captureId = await uploadAndProcess(page);
	await page.goto(`/w/${DEMO_SLUG}/captures/${captureId}`);
	await decodeWithLatest(page);
	return captureId;
}

for (const size of [
	{ width: 1440, height: 900 },
	{ width: 390, height: 844 }
]) {
	test(`the plot stays in view while switching panels at ${size.width}×${size.height}`, async ({
		page
	}) => {
		test.setTimeout(120_000);
		// Signed in at the default size: on a phone the account menu sits inside the header's menu.
		await signIn(page, 'tuner@framewright.test');
		await page.setViewportSize(size);
		await openDecoded(page);
		await plotChannel(page, 'EEC1 · EngineSpeed');
		const plot = page.getByTestId('plot-area');
		const tabs = page.getByRole('tablist', { name: 'Panels' }).getByRole('tab');
		const names = await tabs.allInnerTexts();
		expect(names).toEqual(expect.arrayContaining(['Channels', 'Frames', 'IDs', 'Unknown IDs']));
		for (const name of names) {
			await page.getByRole('tab', { name, exact: true }).click();
			await expect(page.getByRole('tab', { name, exact: true })).toHaveAttribute(
				'aria-selected',
				'true'
			);
			// Read to the end of the panel: the plot is still on screen.
			await page.evaluate(() => window.scrollTo(0, document.documentElement.scrollHeight));
			await expect(plot, `plot hidden with the ${name} panel open`).toBeInViewport();
		}
	});
}

test('a shared view link reopens the same channels and window for another person', async ({
	page,
	browser
}) => {
	test.setTimeout(150_000);
	await openDecoded(page, 'tuner@framewright.test');
	await plotChannel(page, 'EEC1 · EngineSpeed');
	await plotChannel(page, 'ET1 · CoolantTemp');
	const windowText = page.getByTestId('plot-window');
	const whole = await windowText.innerText();
	await page.getByRole('button', { name: 'Zoom in' }).click();
	await page.getByRole('button', { name: 'Later →' }).click();
	await expect(windowText).not.toHaveText(whole);
	await page.getByRole('tab', { name: 'Frames' }).click();
	await expect(page).toHaveURL(/[?&]from=.*&to=/);
	await expect(page).toHaveURL(/[?&]panel=frames/);
	const shown = await windowText.innerText();
	const link = page.url();

	const otherContext = await browser.newContext();
	const other = await otherContext.newPage();
	await signIn(other, 'calibrator@framewright.test');
	await other.goto(link);
	await expect(other.getByTestId('plot-window')).toHaveText(shown, { timeout: 20_000 });
	for (const signal of ['EngineSpeed', 'CoolantTemp']) {
		await expect(other.getByTestId('plot-area')).toContainText(signal);
	}
	await expect(other.getByRole('tab', { name: 'Frames' })).toHaveAttribute('aria-selected', 'true');
	// A reload keeps it too.
	await other.reload();
	await expect(other.getByTestId('plot-window')).toHaveText(shown, { timeout: 20_000 });
	await otherContext.close();
});

test('a derived channel equals the formula computed from the fixture bytes', async ({ page }) => {
	test.setTimeout(150_000);
	const captureId = await openDecoded(page, 'tuner@framewright.test');
	await page.getByRole('tab', { name: 'Derived' }).click();
	const form = page.getByRole('form', { name: 'Derived channel' });
	await form.getByLabel('Name').fill('SpeedPlusCoolant');
	await form.getByLabel('Unit').fill('mixed');
	await form.getByLabel('Formula').fill('EngineSpeed / 60 + CoolantTemp');
	await form.getByRole('button', { name: 'Add derived channel' }).click();
	await expect(page.getByRole('table', { name: 'Derived channels' })).toContainText(
		'SpeedPlusCoolant'
	);

	// A formula that names no channel is refused with the position of the problem.
	await form.getByLabel('Name').fill('Broken');
	await form.getByLabel('Formula').fill('EngineSpeed + Nothing');
	await form.getByRole('button', { name: 'Add derived channel' }).click();
	await expect(form.getByText(/^At character 15:/)).toBeVisible();

	const href = await page
		.getByRole('link', { name: 'Export with derived channels, long form (CSV)' })
		.getAttribute('href');
	expect(href).toContain(captureId);
	const csv = await (await page.request.get(href!)).text();
	const derived = csv
		.trim()
		.split('\n')
		.map((line) => line.split(','))
		.filter((cells) => cells[1] === 'Derived' && cells[2] === 'SpeedPlusCoolant')
		.map((cells) => ({ time: Number(cells[0]), value: Number(cells[3]) }));

	// The reference (docs/derived-channels.md, "Common time base"): at every time either channel has
	// a sample, from when both have had one, each holding its latest value.
	const expected: { time: number; value: number }[] = [];
	let speed: number | null = null;
	let coolant: number | null = null;
	for (let i = 0; i < rows.length; i++) {
		const r = rows[i];
		if (r.id === EEC1) speed = engineSpeed(r.view);
		else if (r.id === ET1) coolant = coolantTemp(r.view);
		else continue;
		if (speed === null || coolant === null) continue;
		const time = r.time - t0;
		const value = speed / 60 + coolant;
		// Two samples at one instant give one derived sample, with both values taken.
		if (expected.length && Math.abs(expected[expected.length - 1].time - time) < 1e-9)
			expected[expected.length - 1].value = value;
		else expected.push({ time, value });
	}
	expect(expected.length).toBeGreaterThan(100);
	expect(derived).toHaveLength(expected.length);
	derived.forEach((d, k) => {
		expect(d.time).toBeCloseTo(expected[k].time, 6);
		// Printed with 12 significant digits (docs/derived-channels.md).
		expect(d.value).toBeCloseTo(expected[k].value, 6);
	});
});
