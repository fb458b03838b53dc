/**
 * The capture view components on the genset demo capture (J1939, 250 kbit/s): plot with zoom and
 * pan, the virtualised frames table, an unknown ID's bit activity and "Define this frame", the bus
 * load chart and the J1939 panel. Every expected figure is computed here from the fixture's bytes
 * (DataView, BigInt), independently of the app's importer and decoder.
 */
import { expect, test } from '@playwright/test';
import { decodeWithLatest, plotChannel, uploadAndProcess } from './capture-helpers';
import { readFixtureRows } from './fixture-rows';
import { signIn } from './helpers';

const slug = 'quillmoor-club-racing';
const capturePath = 'fixtures/genset-idle.csv';

// ---- The reference reading of the fixture (canonical layout, docs/capture-csv.md: time,id,extended,dlc,data) ----
const rows = readFixtureRows(capturePath);
const t0 = rows[0].time;
const relative = (t: number) => Number((t - t0).toFixed(6));

const EEC1 = 0x0cf00400;
const ET1 = 0x18feee00;
// SAE J1939-71 (from memory): engine speed SPN 190, bytes 4–5 of EEC1, 0.125 rpm/bit little-endian;
// coolant temperature SPN 110, byte 1 of ET1, 1 °C/bit with −40 °C offset.
const engineSpeed = (view: DataView) => view.getUint16(3, true) * 0.125;
const coolantTemp = (view: DataView) => view.getUint8(0) - 40;

function channelReference(id: number, read: (v: DataView) => number) {
	const mine = rows.filter((r) => r.id === id);
	const values = mine.map((r) => read(r.view));
	return {
		min: Math.min(...values),
		max: Math.max(...values),
		first: relative(mine[0].time),
		last: relative(mine[mine.length - 1].time)
	};
}

/** Change counts per payload bit (docs/bit-numbering.md: bits of the payload as a little-endian BigInt). */
function referenceBitChanges(id: number): number[] {
	const payloads = rows
		.filter((r) => r.id === id)
		.map((r) => new DataView(r.bytes.buffer).getBigUint64(0, true));
	const changes = new Array<number>(64).fill(0);
	for (let i = 1; i < payloads.length; i++) {
		const x = payloads[i] ^ payloads[i - 1];
		for (let b = 0; b < 64; b++) if ((x >> BigInt(b)) & 1n) changes[b]++;
	}
	return changes;
}

/**
 * DM1 trouble codes from the BAM transfers by hand (SAE J1939-21 transport: TP.CM 0xEC00 with control
 * byte 32 = BAM, size in bytes 1–2, PGN in bytes 5–7; TP.DT 0xEB00 carries a sequence number and 7 bytes.
 * SAE J1939-73 DM1: lamp byte, flash byte, then 4-byte DTCs — SPN low 16 bits, SPN top 3 bits in
 * byte 2 bits 7–5 with FMI in bits 4–0, occurrence count in byte 3 bits 6–0).
 */
function referenceBam() {
	const messages: { pgn: number; sourceAddress: number; data: number[] }[] = [];
	let open: { pgn: number; size: number; data: number[]; sourceAddress: number } | null = null;
	for (const r of rows) {
		const pf = (r.id >> 16) & 0xff;
		if (pf === 0xec && r.bytes[0] === 32) {
			open = {
				size: r.bytes[1] | (r.bytes[2] << 8),
				pgn: r.bytes[5] | (r.bytes[6] << 8) | (r.bytes[7] << 16),
				data: [],
				sourceAddress: r.id & 0xff
			};
		} else if (pf === 0xeb && open) {
			open.data.push(...r.bytes.slice(1));
			if (open.data.length >= open.size) {
				messages.push({
					pgn: open.pgn,
					sourceAddress: open.sourceAddress,
					data: open.data.slice(0, open.size)
				});
				open = null;
			}
		}
	}
	return messages;
}

function dm1Codes(data: number[]) {
	const codes: { spn: number; fmi: number; occurrenceCount: number }[] = [];
	for (let k = 2; k + 4 <= data.length; k += 4) {
		const [a, b, c, d] = data.slice(k, k + 4);
		codes.push({ spn: a | (b << 8) | ((c >> 5) << 16), fmi: c & 0x1f, occurrenceCount: d & 0x7f });
	}
	return codes;
}

const hex = (bytes: ArrayLike<number>) =>
	Array.from(bytes, (b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');

test('the capture views show the genset capture as the fixture bytes say', async ({ page }) => {
	test.setTimeout(150_000);
	await signIn(page, 'tuner@framewright.test');
	const captureId = await uploadAndProcess(page);
	await page.goto(`/w/${slug}/captures/${captureId}`);
	await decodeWithLatest(page);

	// ---- Plot: two channels on strips of their own; their full-range extent equals the reference. ----
	const plot = page.getByRole('region', { name: 'Plot' });
	await plotChannel(page, 'EEC1 · EngineSpeed');
	await page.getByLabel('Plot on').selectOption({ label: 'A new strip' });
	await plotChannel(page, 'ET1 · CoolantTemp');
	await expect(plot.locator('.uplot')).toHaveCount(2, { timeout: 20_000 });
	const speed = channelReference(EEC1, engineSpeed);
	const coolant = channelReference(ET1, coolantTemp);
	const from = Math.min(speed.first, coolant.first);
	const to = Math.max(speed.last, coolant.last);
	const summary = plot.locator('p.sr-only[aria-live="polite"]');
	// Min/max decimation keeps each bucket's extremes, so the whole-capture window shows the true extent.
	await expect(summary).toContainText(`2 strips, 2 channels, from ${from} s to ${to} s.`);
	// The series arrive after the window is set: wait for both before reading their extent.
	await expect(summary).not.toContainText('no samples in this window', { timeout: 20_000 });
	const extent = async (label: string, unit: string) => {
		const pattern = new RegExp(`${label}: (\\S+) to (\\S+) ${unit}`);
		// Each strip's window arrives on its own: wait for this channel's figures, then read them.
		await expect(summary).toContainText(pattern);
		const text = await summary.innerText();
		const m = pattern.exec(text);
		expect(m, `${label} in "${text}"`).not.toBeNull();
		return { min: Number(m![1]), max: Number(m![2]) };
	};
	expect(await extent('EEC1 · EngineSpeed', 'rpm')).toEqual({ min: speed.min, max: speed.max });
	expect(await extent('ET1 · CoolantTemp', '°C')).toEqual({ min: coolant.min, max: coolant.max });

	// Zoom in halves the window around its middle and asks the server for that window only.
	const zoomed = page.waitForRequest(
		(r) => r.url().includes('/series?') && r.url().includes('from=')
	);
	await plot.getByRole('button', { name: 'Zoom in' }).click();
	const request = new URL((await zoomed).url());
	const span = to - from;
	expect(Number(request.searchParams.get('from'))).toBeCloseTo(from + span / 4, 6);
	expect(Number(request.searchParams.get('to'))).toBeCloseTo(from + (3 * span) / 4, 6);

	// Arrow right on the focused plot pans a quarter of the window later.
	await plot.locator('[aria-roledescription="plot"]').focus();
	const panned = page.waitForRequest(
		(r) => r.url().includes('/series?') && r.url().includes('from=')
	);
	await page.keyboard.press('ArrowRight');
	const pan = new URL((await panned).url());
	expect(Number(pan.searchParams.get('from'))).toBeCloseTo(from + span / 4 + span / 8, 6);

	// A drag across a plot zooms to the dragged span (narrower than the current half window).
	const over = plot.locator('.u-over').first();
	const box = (await over.boundingBox())!;
	const dragged = page.waitForRequest(
		(r) => r.url().includes('/series?') && r.url().includes('from=')
	);
	await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
	await page.mouse.down();
	await page.mouse.move(box.x + box.width * 0.5, box.y + box.height / 2, { steps: 5 });
	await page.mouse.up();
	const drag = new URL((await dragged).url());
	const dragSpan = Number(drag.searchParams.get('to')) - Number(drag.searchParams.get('from'));
	expect(dragSpan).toBeGreaterThan(0);
	expect(dragSpan).toBeLessThan(span / 2 / 3);
	await plot.getByRole('button', { name: 'Show all' }).click();
	await expect(summary).toContainText(`from ${from} s to ${to} s.`);

	// ---- Frames table: length, filter by ID, a frame's decoded signals, the far end of the list. ----
	await page.getByRole('tab', { name: 'Frames' }).click();
	const frames = page.getByRole('region', { name: 'Frames' });
	await expect(frames.getByRole('status').first()).toHaveText(
		`${rows.length.toLocaleString('en')} frames`
	);
	const table = frames.getByRole('table', { name: 'Captured frames' });
	await expect(table.getByRole('row').nth(1)).toContainText(hex(rows[0].bytes));
	await frames.getByLabel('Filter by ID (hex)').fill('0CF00400');
	await frames.getByRole('button', { name: 'Filter' }).click();
	const eec1Rows = rows.filter((r) => r.id === EEC1);
	await expect(frames.getByRole('status').first()).toHaveText(
		`${eec1Rows.length.toLocaleString('en')} frames with ID 0x0CF00400`
	);
	await table.getByRole('row').nth(1).click();
	const signals = frames.getByRole('table', { name: /^Decoded signals of frame/ });
	await expect(signals.getByRole('row', { name: /^EngineSpeed/ })).toContainText(
		`${engineSpeed(eec1Rows[0].view)} rpm`
	);
	await frames.getByRole('button', { name: 'Show all frames' }).click();
	await frames.getByLabel('Filter by ID (hex)').fill('not-hex');
	await frames.getByRole('button', { name: 'Filter' }).click();
	await expect(frames.getByText('Enter a CAN ID in hex')).toBeVisible();
	// Scrolled to the bottom, the virtual window renders the last frame.
	await table.locator('xpath=..').evaluate((el) => (el.scrollTop = el.scrollHeight));
	await expect(table.getByRole('row', { name: new RegExp(`^${rows.length - 1} `) })).toContainText(
		hex(rows[rows.length - 1].bytes)
	);

	// ---- Unknown IDs: a proprietary PGN's bit activity equals the BigInt reference. ----
	await page.getByRole('tab', { name: 'Unknown IDs' }).click();
	const unknown = page.getByRole('region', { name: 'Unknown IDs' });
	const proprietary = 0x18ff1027;
	await unknown.getByRole('button', { name: 'Bit activity of 0x18FF1027' }).click();
	const grid = unknown.getByRole('table', { name: /^Bit activity of 0x18FF1027/ });
	const expected = referenceBitChanges(proprietary);
	const frameCount = rows.filter((r) => r.id === proprietary).length;
	for (const bit of [0, 1, 7, 8, 12, 20, 63]) {
		const cell = grid.locator(`td[data-bit="${bit}"]`);
		await expect(cell).toHaveAttribute(
			'title',
			new RegExp(`^Payload bit ${bit}: ${expected[bit].toLocaleString('en')} changes`)
		);
		// Numbers appear on focus
		if (bit === 0) {
			await cell.focus();
			await expect(cell.locator('span').first()).toHaveCSS('opacity', '1');
		}
	}
	expect(frameCount).toBeGreaterThan(1);
	// A viewer cannot change the map.
	await expect(unknown.getByRole('button', { name: 'Define this frame' })).toHaveCount(0);

	// ---- Bus load: the configured bit rate and a drawn line. ----
	await page.getByRole('tab', { name: 'Bus load' }).click();
	const load = page.getByRole('region', { name: 'Bus load' });
	await expect(load).toContainText('250 kbit/s');
	await expect(load.getByRole('img', { name: /^Bus load at 250 kbit\/s: mean/ })).toBeVisible();

	// ---- J1939: the DM1 codes and the reassembled BAM messages read by hand from the fixture. ----
	await page.getByRole('tab', { name: 'J1939' }).click();
	const j1939 = page.getByRole('region', { name: 'J1939' });
	const bam = referenceBam();
	expect(bam.length).toBeGreaterThan(0);
	await expect(
		j1939.getByRole('table', { name: 'Reassembled multi-packet messages' }).getByRole('row')
	).toHaveCount(bam.length + 1);
	await expect(
		j1939.getByRole('table', { name: 'Reassembled multi-packet messages' }).getByRole('row').nth(1)
	).toContainText(hex(bam[0].data));
	const dm1 = bam.find((m) => m.pgn === 0xfeca)!; // DM1 is PGN 65226 (SAE J1939-73)
	const codes = j1939.getByRole('table', { name: 'DM1 trouble codes' });
	const expectedCodes = dm1Codes(dm1.data);
	await expect(codes.getByRole('row')).toHaveCount(expectedCodes.length + 1);
	for (const code of expectedCodes) {
		const row = codes
			.getByRole('row')
			.filter({ has: page.getByRole('cell', { name: String(code.spn), exact: true }) })
			.filter({ has: page.getByRole('cell', { name: String(code.fmi), exact: true }) });
		await expect(row).toHaveCount(1);
		const cells = row.getByRole('cell');
		await expect(cells.nth(1)).toHaveText(
			`${dm1.sourceAddress} (0x${dm1.sourceAddress.toString(16).toUpperCase().padStart(2, '0')})`
		);
		await expect(cells.nth(4)).toHaveText(String(code.occurrenceCount));
	}
	// Lamp byte 0x04: amber warning lamp bits 4–3 = 01 = on (SAE J1939-73, from memory).
	expect(dm1.data[0]).toBe(0x04);
	await expect(codes.getByRole('row').nth(1)).toContainText('Amber warning on');
});

test('an editor defines an unknown ID into the map draft, once', async ({ page }) => {
	test.setTimeout(120_000);
	await signIn(page, 'calibrator@framewright.test');
	const captureId = await uploadAndProcess(page);
	await page.goto(`/w/${slug}/captures/${captureId}`);
	await decodeWithLatest(page);
	await page.getByRole('tab', { name: 'Unknown IDs' }).click();
	const unknown = page.getByRole('region', { name: 'Unknown IDs' });
	await unknown.getByRole('button', { name: 'Bit activity of 0x18FF1127' }).click();
	await unknown.getByRole('button', { name: 'Define this frame' }).click();
	// The confirmation says where the frame went, without the draft's internal version number.
	await expect(unknown.getByRole('status')).not.toContainText('version');
	await expect(unknown.getByRole('status')).toContainText(
		'0x18FF1127 was added to the map’s draft as a new frame without signals'
	);
	// The draft now defines it, so a second try is refused with the server's reason (409).
	const refused = page.waitForResponse((r) => r.url().includes('/define-frame'));
	await unknown.getByRole('button', { name: 'Define this frame' }).click();
	expect((await refused).status()).toBe(409);
	await expect(unknown.getByRole('alert')).toBeVisible();
});
