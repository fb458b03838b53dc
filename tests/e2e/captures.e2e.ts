import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { plotChannel } from './capture-helpers';
import {
	capturePath,
	frameOf,
	map,
	readByteAligned,
	referenceRange,
	rows,
	shownRange
} from './club-racer-reference';
import { signIn } from './helpers';

const slug = 'quillmoor-club-racing';

/** Decoded samples in the whole capture: each mapped frame gives its plain signals, plus those of its multiplexer page. */
function referenceSampleCount(): number {
	let total = 0;
	for (const row of rows) {
		const frame = map.frames.find((f) => Number(f.id) === row.id);
		if (!frame) continue;
		const mux = frame.signals.find((s) => s.multiplexer);
		const page = mux ? readByteAligned(row.view, mux) : null;
		total += frame.signals.filter(
			(s) => s.muxValue === null || s.muxValue === undefined || s.muxValue === page
		).length;
	}
	return total;
}

test('a viewer takes the demo capture from upload to checked, plotted and exported channels', async ({
	page
}) => {
	test.setTimeout(120_000);
	await signIn(page, 'tuner@framewright.test');
	await page.goto(`/w/${slug}/captures`);
	await expect(page.getByRole('heading', { level: 1, name: 'Captures' })).toBeVisible();

	// Upload one file: the page moves on to its layout confirmation.
	await page.getByLabel('Choose capture files').setInputFiles(capturePath);
	await expect(page.getByRole('heading', { name: 'Confirm the layout' })).toBeVisible({
		timeout: 30_000
	});
	// The canonical layout is recognised: each column's role is shown above the first rows.
	const preview = page.getByRole('table', { name: /First \d+ rows of the file/ });
	for (const role of ['time (s)', 'ID (hex)', 'extended flag', 'data (hex bytes)']) {
		await expect(preview.getByRole('columnheader', { name: role })).toBeVisible();
	}
	await expect(preview.getByText('0x5F0 · 8 B · 15 14 03 E8 03 E8 03 6F').first()).toBeVisible();
	await page.getByRole('button', { name: 'Process capture' }).click();

	// Processing reads every data line of the fixture into a frame.
	await expect(page.getByRole('heading', { name: 'Import report' })).toBeVisible({
		timeout: 60_000
	});
	await expect(page.getByText(`${rows.length} frames read from`)).toBeVisible();
	await expect(page.getByText('no bad rows.')).toBeVisible();

	// Decode with the demo map's latest revision (the one marked latest in the list).
	const decodePanel = page.getByRole('region', { name: 'Decode', exact: true });
	await decodePanel.getByLabel('Map').selectOption({ label: map.name });
	const revision = decodePanel.getByLabel('Revision');
	const latest = (await revision.locator('option', { hasText: '(latest)' }).innerText()).split(
		' '
	)[0];
	expect(latest).toMatch(/^r\d+$/);
	await revision.selectOption({ label: `${latest} (latest)` });
	await decodePanel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${map.name} ${latest}`)).toBeVisible({
		timeout: 30_000
	});
	// The decode is listed under Decodes; the workbench has moved on to its channels.
	await expect(page.getByRole('tab', { name: 'Channels' })).toHaveAttribute(
		'aria-selected',
		'true'
	);
	await page.getByRole('tab', { name: 'Decodes' }).click();
	await expect(
		decodePanel.getByRole('row', { name: new RegExp(`${map.name}.*${latest}`) })
	).toBeVisible();
	await page.getByRole('tab', { name: 'Channels' }).click();

	// Channel statistics equal the reference computed from the fixture bytes with DataView.
	for (const [frameName, signalName] of [
		['EngineCore', 'EngineSpeed'],
		['EngineTemperatures', 'CoolantTemp'],
		['Pressures', 'OilPressure']
	] as const) {
		const expected = referenceRange(frameName, signalName);
		const table = page.getByRole('table', { name: new RegExp(`^${frameName} `) });
		const shown = await shownRange(
			table.getByRole('row', { name: new RegExp(`^${signalName}\\b`) })
		);
		// Six significant digits are shown; scale 0.1 values compare to that precision.
		expect(shown.min).toBeCloseTo(expected.min, 6);
		expect(shown.max).toBeCloseTo(expected.max, 6);
	}

	// Plot two channels on one time axis (the second joins the first one's strip).
	await plotChannel(page, 'EngineCore · EngineSpeed');
	await plotChannel(page, 'Pressures · OilPressure');
	await expect(
		page.getByRole('list', { name: 'Channels on strip 1' }).getByRole('listitem')
	).toHaveCount(2);
	await expect(page.getByTestId('plot-area').locator('canvas').first()).toBeVisible({
		timeout: 20_000
	});

	// An ID the map does not define: its frame count matches the fixture, and its bit activity opens.
	const unknownId = 0x5f8;
	expect(map.frames.some((f) => Number(f.id) === unknownId)).toBe(false);
	await page.getByRole('tab', { name: 'Unknown IDs' }).click();
	const unknownRow = page
		.getByRole('region', { name: 'Unknown IDs' })
		.getByRole('row', { name: /^0x5F8\b/ });
	await expect(unknownRow.getByRole('cell').first()).toHaveText(
		rows.filter((r) => r.id === unknownId).length.toLocaleString('en')
	);
	await page.getByRole('button', { name: 'Bit activity of 0x5F8' }).click();
	await expect(page.getByRole('table', { name: /^Bit activity of 0x5F8/ })).toBeVisible();

	// Download the decoded channels (long form): its header, and one row per decoded sample.
	await page.getByRole('tab', { name: 'Export' }).click();
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Decoded channels, long form (CSV)' }).click()
	]);
	expect(download.suggestedFilename()).toContain(latest);
	const csv = readFileSync((await download.path())!, 'utf8')
		.trimEnd()
		.split(/\r?\n/);
	expect(csv[0]).toBe('time,frame,signal,value,unit');
	expect(csv.length - 1).toBe(referenceSampleCount());
	for (const [frameName, signalName] of [
		['EngineCore', 'EngineSpeed'],
		['Pressures', 'OilPressure']
	] as const) {
		const samples = csv.filter((line) => line.split(',')[2] === signalName).length;
		expect(samples, `${frameName}.${signalName} samples`).toBe(
			referenceRange(frameName, signalName).count
		);
	}

	// Switch revision and compare: the seeded draft raises CoolantTemp's max above r1's (the fixture's 105 °C),
	// and changes nothing about EngineSpeed.
	expect(frameOf('EngineTemperatures').signals.find((s) => s.name === 'CoolantTemp')).toMatchObject(
		{ max: 105 }
	);
	await page.getByRole('tab', { name: 'Decodes' }).click();
	await revision.selectOption('1');
	await decodePanel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${map.name} r1`)).toBeVisible();
	await page.getByRole('tab', { name: 'Decodes' }).click();
	await revision.selectOption('draft');
	await decodePanel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${map.name} draft`)).toBeVisible();
	await page.getByRole('tab', { name: 'Decodes' }).click();
	await decodePanel
		.getByRole('button', { name: `Compare with ${map.name} r1` })
		.first()
		.click();
	const comparison = page.getByRole('table', {
		name: 'Channel statistics of two decodes side by side'
	});
	await expect(
		comparison.getByRole('row', { name: /^EngineTemperatures\.CoolantTemp\b/ })
	).toContainText('≠ differs');
	await expect(comparison.getByRole('row', { name: /^EngineCore\.EngineSpeed\b/ })).toContainText(
		'same'
	);
});

test('several files at once: each gets its own progress, refusals say why, good files wait for layout confirmation', async ({
	page
}) => {
	await signIn(page, 'tuner@framewright.test');
	await page.goto(`/w/${slug}/captures`);
	// Bytes no capture CSV contains (the PNG signature, then NUL bytes), and an empty file.
	const binary = Buffer.from([
		0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52
	]);
	await page.getByLabel('Choose capture files').setInputFiles([
		{ name: 'photo.png', mimeType: 'image/png', buffer: binary },
		{ name: 'empty.csv', mimeType: 'text/csv', buffer: Buffer.alloc(0) },
		{
			name: 'genset-idle.csv',
			mimeType: 'text/csv',
			buffer: readFileSync('fixtures/genset-idle.csv')
		}
	]);
	const uploads = page.getByRole('list', { name: 'Uploads' });
	await expect(
		uploads.getByRole('link', { name: 'Confirm the layout of genset-idle.csv' })
	).toBeVisible({ timeout: 30_000 });
	// Several files stay on the list page; each refusal names its file.
	await expect(page).toHaveURL(new RegExp(`/w/${slug}/captures$`));
	await expect(uploads.getByRole('alert').filter({ hasText: 'photo.png' })).toContainText(
		/not a capture/i
	);
	await expect(uploads.getByRole('alert').filter({ hasText: 'empty.csv' })).toContainText(/empty/i);
	await expect(uploads.getByRole('listitem')).toHaveCount(3);

	// The accepted file is listed, waiting for its layout to be confirmed.
	const listed = page
		.getByRole('table', { name: /Captures in this workspace/ })
		.getByRole('row', { name: /genset-idle/ })
		.first();
	await expect(listed).toContainText('Layout to confirm');
});

test('a variant layout is shown column by column and can be corrected before processing', async ({
	page
}) => {
	await signIn(page, 'tuner@framewright.test');
	await page.goto(`/w/${slug}/captures`);
	// Semicolons, millisecond times, no extended or DLC column, one column per payload byte (docs/capture-csv.md variants).
	const variant = [
		'Timestamp_ms;CAN_ID;D0;D1;D2',
		'1000;100;11;22;33',
		'1010;100;11;22;34',
		'1020;7E8;AA;BB;CC',
		''
	].join('\n');
	await page
		.getByLabel('Choose capture files')
		.setInputFiles({ name: 'variant.csv', mimeType: 'text/csv', buffer: Buffer.from(variant) });
	await expect(page.getByRole('heading', { name: 'Confirm the layout' })).toBeVisible({
		timeout: 30_000
	});

	const preview = page.getByRole('table', { name: /First \d+ rows of the file/ });
	for (const role of ['time (ms)', 'ID (hex)', 'byte 0', 'byte 1', 'byte 2']) {
		await expect(preview.getByRole('columnheader', { name: role })).toBeVisible();
	}
	const line3 = preview.getByRole('row', { name: /^3 / });
	await expect(line3).toContainText('0.010000 s · 0x100 · 3 B · 11 22 34');

	// A wrong unit shows at once in the preview (10 ms apart becomes 10 s apart); putting it right restores it.
	await page.getByLabel('Time unit').selectOption('s');
	await expect(line3).toContainText('10.000000 s');
	await page.getByLabel('Time unit').selectOption('ms');
	await expect(line3).toContainText('0.010000 s');

	await page.getByRole('button', { name: 'Process capture' }).click();
	await expect(page.getByRole('heading', { name: 'Import report' })).toBeVisible({
		timeout: 30_000
	});
	await expect(page.getByText('3 frames read from')).toBeVisible();
});
