/**
 * A capture of two buses with a direction column and a time-of-day column that passes midnight
 * (invented demo traffic): a calibrator uploads it, decodes it, reads wall-clock times, picks one
 * bus, and sees that bus's load follow the bit rate set for the capture. Expected bus loads are
 * computed here from the ISO 11898-1 frame layout spelled out bit by bit
 * (src/lib/can/testing/reference-frame-bits.ts), engine speeds with DataView (SAE J1939-71, from
 * memory: EEC1 bytes 4–5, 0.125 rpm/bit, little-endian).
 */
import { expect, test } from '@playwright/test';
import { referenceFrameBits } from '../../src/lib/can/testing/reference-frame-bits';
import { decodeWithLatest, DEMO_SLUG, plotChannel, uploadAndProcess } from './capture-helpers';
import { signIn } from './helpers';

const EEC1 = 0x0cf00400;
/** [time of day, bus, id (hex), direction, payload]. */
const rows: [string, string, number, string, number[]][] = [];
const clockText = (s: number) => {
	const t = ((s % 86_400) + 86_400) % 86_400;
	const hh = String(Math.floor(t / 3600)).padStart(2, '0');
	const mm = String(Math.floor((t % 3600) / 60)).padStart(2, '0');
	return `${hh}:${mm}:${(t % 60).toFixed(3).padStart(6, '0')}`;
};
for (let k = 0; k < 10; k++) {
	const at = clockText(86_399.95 + k * 0.01); // 23:59:59.950 … 00:00:00.040
	const rpm = 800 + 10 * k;
	rows.push([
		at,
		'body',
		EEC1,
		'Rx',
		[0xf0, 0x7d, 0x7d, (rpm * 8) & 0xff, (rpm * 8) >> 8, 0, 0xf0, 0x7d]
	]);
	rows.push([at, 'chassis', 0x100, 'Rx', [1, 2, 3, k]]);
	if (k % 2 === 0) rows.push([at, 'chassis', 0x2a0, 'Tx', [0xff, 0, 0xff]]);
}
const hex = (bytes: number[]) =>
	bytes.map((b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');
const csv =
	[
		'time,bus,id,dir,data',
		...rows.map(
			([t, b, id, d, data]) => `${t},${b},${id.toString(16).toUpperCase()},${d},${hex(data)}`
		)
	].join('\n') + '\n';

/** Percent of one 0.1 s window (the 90 ms of traffic fit in one) at `bitrate`, as the chart prints it (3 significant digits). */
function referenceLoad(bus: string, bitrate: number): string {
	let bits = 0;
	for (const [, b, id, , data] of rows) {
		if (b !== bus) continue;
		const ref = referenceFrameBits(id, id > 0x7ff, Uint8Array.from(data));
		bits += ref.bits + ref.stuffBits + 3; // + the 3-bit intermission (ISO 11898-1)
	}
	return String(Number(((100 * bits) / (bitrate * 0.1)).toPrecision(3)));
}

test('two buses: wall-clock times, a bus picked, per-bus load following the capture’s bit rate', async ({
	page
}) => {
	test.setTimeout(120_000);
	await signIn(page, 'calibrator@framewright.test');
	const api = `/api/workspaces/${DEMO_SLUG}/captures`;
	const upload = await page.request.post(`${api}?name=two-buses.csv`, {
		data: csv,
		headers: { 'content-type': 'text/csv' }
	});
	expect(upload.status()).toBe(201);
	const { capture } = (await upload.json()) as { capture: { id: string } };

	// The layout confirmation screen: the guess is confirmed as it is.
	await page.goto(`/w/${DEMO_SLUG}/captures/${capture.id}`);
	await page.getByRole('button', { name: /^Process/ }).click();
	await expect(page.getByText('Not decoded yet: choose a map')).toBeVisible({ timeout: 60_000 });
	await expect(
		page.getByText('Recorded on 2 buses (body, chassis), with the direction of each frame.')
	).toBeVisible();
	await expect(page.getByText('First frame at 23:59:59.950')).toBeVisible();
	await decodeWithLatest(page);

	// ---- Wall-clock times: the plot's window and the frames table read the recording's clock. ----
	await plotChannel(page, 'EEC1 · EngineSpeed');
	await expect(page.getByTestId('plot-clock')).toHaveText('23:59:59.950 – 00:00:00.040 +1 d');
	await page.getByRole('tab', { name: 'Frames' }).click();
	const frames = page.getByRole('table', { name: 'Captured frames' });
	const first = frames.getByRole('row').nth(1);
	await expect(first).toContainText('23:59:59.950');
	await expect(first).toContainText('body');
	await expect(first).toContainText('Rx');
	const sent = frames.getByRole('row').nth(3); // the third frame: 0x2A0 on chassis, sent by the logger
	await expect(sent).toContainText('chassis');
	await expect(sent).toContainText('Tx');
	await expect(sent).toContainText('2A0');
	await sent.click();
	await expect(page.getByRole('heading', { name: /^Frame 2/ })).toContainText(
		'(23:59:59.950) on chassis (sent by the logger)'
	);

	// ---- Bus load: one figure per bus at the rate guessed from the decode's map (250 kbit/s). ----
	await page.getByRole('tab', { name: 'Bus load' }).click();
	await expect(page.getByTestId('capture-bitrate')).toContainText(
		'250 kbit/s (guessed from map Generator set engine (J1939))'
	);
	for (const bus of ['body', 'chassis'])
		await expect(
			page.getByRole('img', {
				name: new RegExp(`^Bus load on ${bus} at 250 kbit/s: mean ${referenceLoad(bus, 250_000)} %`)
			})
		).toBeVisible({ timeout: 20_000 });

	// ---- One bus picked: its figures only. ----
	await page.getByLabel('Bus', { exact: true }).selectOption({ label: 'chassis' });
	await expect(page.getByRole('heading', { name: 'Bus load on body' })).toHaveCount(0);
	await expect(page.getByRole('heading', { name: 'Bus load on chassis' })).toBeVisible();

	// ---- The capture's own bit rate, set by form: the load follows it. ----
	await page.getByLabel('Bit rate (bit/s)').fill('fast');
	await page.getByRole('button', { name: 'Set bit rate' }).click();
	await expect(page.getByText('A whole number of bit/s from 1000 to 8000000')).toBeVisible();
	await page.getByLabel('Bit rate (bit/s)').fill('125000');
	await page.getByRole('button', { name: 'Set bit rate' }).click();
	await expect(page.getByText('Bit rate set to 125 kbit/s.')).toBeVisible();
	await expect(page.getByTestId('capture-bitrate')).toContainText(
		'125 kbit/s (set for this capture)'
	);
	await expect(
		page.getByRole('img', {
			name: new RegExp(
				`^Bus load on chassis at 125 kbit/s: mean ${referenceLoad('chassis', 125_000)} %`
			)
		})
	).toBeVisible({ timeout: 20_000 });

	// ---- Per-bus ID statistics: the chassis IDs only, then every (bus, ID) with its bus. ----
	await page.getByRole('tab', { name: 'IDs', exact: true }).click();
	const ids = page.getByRole('table', { name: /Every CAN ID seen/ });
	await expect(ids.getByRole('row')).toHaveCount(3);
	await page.getByLabel('Bus', { exact: true }).selectOption({ label: 'All buses' });
	await expect(ids.getByRole('row')).toHaveCount(4);
	await expect(ids.getByRole('row').nth(1)).toContainText('body');
});

test.describe('without JavaScript', () => {
	test.use({ javaScriptEnabled: false });

	test('the capture’s bit rate is set by a plain form, refusals tied to the field', async ({
		page
	}) => {
		await signIn(page, 'calibrator@framewright.test');
		const captureId = await uploadAndProcess(page, { name: 'two-buses-noscript.csv', data: csv });

		await page.goto(`/w/${DEMO_SLUG}/captures/${captureId}?panel=bus`);
		// Nothing decoded yet: the workspace's usual map bit rate, said to be a guess.
		await expect(page.getByTestId('capture-bitrate')).toContainText(
			'(guessed from the workspace’s maps'
		);
		const rate = page.getByLabel('Bit rate (bit/s)');
		await rate.fill('12');
		await page.getByRole('button', { name: 'Set bit rate' }).click();
		await expect(page.getByLabel('Bit rate (bit/s)')).toHaveAttribute('aria-invalid', 'true');
		await expect(page.getByText('A whole number of bit/s from 1000 to 8000000')).toBeVisible();
		await expect(page.getByLabel('Bit rate (bit/s)')).toHaveValue('12');
		await page.getByLabel('Bit rate (bit/s)').fill('125000');
		await page.getByLabel('CAN FD data phase (bit/s, optional)').fill('1000000');
		await page.getByRole('button', { name: 'Set bit rate' }).click();
		await expect(
			page.getByText('Bit rate set to 125 kbit/s, data phase 1000 kbit/s.')
		).toBeVisible();
		await expect(page.getByTestId('capture-bitrate')).toContainText(
			'125 kbit/s, data phase 1000 kbit/s (set for this capture)'
		);
	});
});
