// Recordings as loggers write them (issue 11): the demo session rewritten in three awkward layouts —
// semicolons with `h`-suffix IDs and spaced bytes, a bus and a direction column, and a gzip-compressed
// time-of-day file — each uploaded through the page, its layout confirmed, decoded with the demo
// map and its channel figures compared with the fixture's bytes read by DataView (the reference
// reader of byte order, club-racer-reference.ts). One capture is then read again with other layouts.
import { gzipSync } from 'node:zlib';
import { expect, test, type Page } from '@playwright/test';
import { decodeWithLatest } from './capture-helpers';
import { map, referenceRange, rows, shownRange } from './club-racer-reference';
import type { FixtureRow } from './fixture-rows';
import { signIn } from './helpers';

const slug = 'quillmoor-club-racing';

const hex = (n: number, width = 2) => n.toString(16).toUpperCase().padStart(width, '0');
const spaced = (r: FixtureRow) => [...r.bytes].map((b) => hex(b)).join(' ');
/** hh:mm:ss.ffffff, the recording starting at 14:05 (invented). */
function timeOfDay(seconds: number): string {
	const s = 14 * 3600 + 5 * 60 + seconds;
	const two = (n: number) => String(Math.floor(n)).padStart(2, '0');
	return `${two(s / 3600)}:${two((s % 3600) / 60)}:${(s % 60).toFixed(6).padStart(9, '0')}`;
}
const lines = (header: string, row: (r: FixtureRow, i: number) => string) =>
	[header, ...rows.map(row)].join('\n') + '\n';

const FILES = [
	{
		name: 'dash-logger-semicolon.csv',
		buffer: Buffer.from(
			lines(
				'Time;ID;DLC;Data',
				(r) => `${r.time.toFixed(6)};${hex(r.id, 3)}h;${r.bytes.length};${spaced(r)}`
			)
		)
	},
	{
		name: 'two-way-logger.csv',
		buffer: Buffer.from(
			lines(
				'time,bus,dir,id,dlc,data',
				(r, i) =>
					`${r.time.toFixed(6)},pt,${i % 4 === 0 ? 'Tx' : 'Rx'},${hex(r.id, 3)},${r.bytes.length},${spaced(r)}`
			)
		)
	},
	{
		name: 'pit-logger.csv.gz',
		buffer: gzipSync(
			lines(
				'clock,id,dlc,data',
				(r) => `${timeOfDay(r.time)},${hex(r.id, 3)},${r.bytes.length},${spaced(r)}`
			)
		)
	}
];

const CHECKED = [
	['EngineCore', 'EngineSpeed'],
	['EngineTemperatures', 'CoolantTemp'],
	['Pressures', 'OilPressure']
] as const;

/** The Channels panel's min and max of each checked signal equal the DataView reference. */
async function expectReferenceChannels(page: Page) {
	await page.getByRole('tab', { name: 'Channels' }).click();
	for (const [frameName, signalName] of CHECKED) {
		const expected = referenceRange(frameName, signalName);
		const table = page.getByRole('table', { name: new RegExp(`^${frameName} `) });
		const shown = await shownRange(
			table.getByRole('row', { name: new RegExp(`^${signalName}\\b`) })
		);
		expect(shown.min, `${frameName}.${signalName} min`).toBeCloseTo(expected.min, 6);
		expect(shown.max, `${frameName}.${signalName} max`).toBeCloseTo(expected.max, 6);
	}
}

const importReport = (page: Page) => page.getByRole('region', { name: 'Import report' });

test('three awkward recordings are confirmed, decoded to the DataView reference, and one is read again', async ({
	page,
	browser
}) => {
	test.setTimeout(240_000);
	await signIn(page, 'tuner@framewright.test');
	const first = rows[0];

	for (const file of FILES) {
		await page.goto(`/w/${slug}/captures`);
		// Choosing a file before the page has hydrated does nothing: choose again until the upload shows
		// (no upload can have started when its list is not there).
		await expect(async () => {
			await page
				.getByLabel('Choose capture files')
				.setInputFiles({ name: file.name, mimeType: 'text/csv', buffer: file.buffer });
			await expect(
				page
					.getByRole('list', { name: 'Uploads' })
					.or(page.getByRole('heading', { name: 'Confirm the layout' }))
			).toBeVisible({ timeout: 2000 });
		}).toPass({ timeout: 20_000 });
		await expect(page.getByRole('heading', { name: 'Confirm the layout' })).toBeVisible({
			timeout: 30_000
		});
		// The first row reads as the fixture's first frame, whatever the notation.
		const preview = page.getByRole('table', { name: /First \d+ rows of the file/ });
		await expect(
			preview
				.getByText(`0x${hex(first.id, 3)} · ${first.bytes.length} B · ${spaced(first)}`)
				.first()
		).toBeVisible();
		await page.getByRole('button', { name: 'Process capture' }).click();
		await expect(importReport(page)).toContainText(`${rows.length} frames read from`, {
			timeout: 60_000
		});
		await expect(importReport(page)).toContainText('no bad rows.');
		await decodeWithLatest(page, map.name);
		await expectReferenceChannels(page);
	}

	// The last one (the gzip file) read again: first with a layout that reads no frame — refused,
	// the earlier result kept — then with its header taken as a row, which reads every frame again.
	await page.getByRole('tab', { name: 'Decodes' }).click();
	const reread = page.getByRole('button', { name: 'Read the file again with another layout' });
	await reread.focus();
	await page.keyboard.press('Enter');
	await expect(page.getByRole('heading', { name: 'Read the file again' })).toBeVisible();
	await page.getByLabel('Time written as').selectOption({ label: 'a number' });
	await page.getByRole('button', { name: 'Read again with this layout' }).click();
	await expect(
		page.getByRole('alert').filter({ hasText: 'earlier result is kept' }).first()
	).toBeVisible({
		timeout: 60_000
	});
	await expect(importReport(page)).toContainText(`${rows.length} frames read from`);
	await expect(importReport(page)).toContainText('no bad rows.');

	await page.getByRole('button', { name: 'Read the file again with another layout' }).click();
	await page.getByLabel('First row is a header').uncheck();
	await page.getByRole('button', { name: 'Read again with this layout' }).click();
	await expect(importReport(page)).toContainText('1 bad row', { timeout: 60_000 });
	await expect(importReport(page)).toContainText(`${rows.length} frames read from`);
	await expect(page.getByText('line 1:').first()).toBeVisible();
	// The decode on show was made again from the new frames: the same reference values.
	await expectReferenceChannels(page);

	// The audit log (owners read it) names the re-read.
	const owner = await (await browser.newContext()).newPage();
	await signIn(owner, 'owner@framewright.test');
	await owner.goto(`/w/${slug}/audit`);
	await expect(
		owner.getByText(/read the capture pit-logger\.csv\.gz again with another layout/).first()
	).toBeVisible();
});
