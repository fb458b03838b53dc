import { expect, test, type Page } from '@playwright/test';
import { readFixtureRows } from './fixture-rows';
import { signIn } from './helpers';

const slug = 'quillmoor-club-racing';
const mapName = 'Club racer engine controller';
const capturePath = 'fixtures/club-racer-session.csv';

// ---- The reference: the fixture read by hand, independently of the app's importer, decoder and alert engine. ----

/** (time from the first frame, payload) per row of the canonical capture CSV (docs/capture-csv.md). */
const rows = readFixtureRows(capturePath);
const t0 = rows[0].time;
const recordingEnd = rows[rows.length - 1].time - t0;

// Read with DataView (the reference for byte order): ThrottlePosition is big-endian u16 in bytes 2–3
// of 0x5F0 × 0.1 %; VehicleSpeed is little-endian u16 in bytes 1–2 of 0x5F3 × 0.01 km/h (fixture map).
const throttle = rows
	.filter((r) => r.id === 0x5f0)
	.map((r) => ({ t: r.time - t0, v: r.view.getUint16(2, false) * 0.1 }));
const speed = rows
	.filter((r) => r.id === 0x5f3)
	.map((r) => ({ t: r.time - t0, v: r.view.getUint16(1, true) * 0.01 }));

interface Expected {
	start: number;
	end: number | null;
	latched: boolean;
}

/**
 * An "above" alarm with deadband and no delays, replayed by hand after ISA-18.2 / IEC 62682 (from
 * memory): it activates on a sample above the setpoint, returns on a sample below setpoint − deadband;
 * a latching alarm that returns unacknowledged waits for an acknowledgement, which then clears it.
 */
function expectedEvents(
	samples: { t: number; v: number }[],
	setpoint: number,
	deadband: number,
	latching: boolean,
	acks: number[] = []
): Expected[] {
	const events: Expected[] = [];
	let state: 'normal' | 'active' | 'returned' = 'normal';
	const pending = [...acks];
	for (const { t, v } of samples) {
		while (pending.length && pending[0] < t) {
			const ack = pending.shift()!;
			if (state === 'returned') {
				events[events.length - 1].end = ack;
				state = 'normal';
			}
		}
		if (state !== 'active' && v > setpoint) {
			if (state === 'normal') events.push({ start: t, end: null, latched: false });
			state = 'active';
		} else if (state === 'active' && v < setpoint - deadband) {
			if (latching) {
				events[events.length - 1].latched = true;
				state = 'returned';
			} else {
				events[events.length - 1].end = t;
				state = 'normal';
			}
		}
	}
	return events;
}

async function setField(page: Page, label: string, value: string) {
	const input = page.getByLabel(label, { exact: false });
	await input.fill(value);
	await input.blur(); // the table applies an edit when the field is left, like a spreadsheet
}

/** The start and end cells of the event rows of one rule, as numbers (null = still active at the end). */
async function shownEvents(page: Page, ruleName: string) {
	const table = page.getByRole('table', { name: 'Alert events' });
	const rowsShown = table
		.getByRole('row')
		.filter({ has: page.getByRole('rowheader', { name: ruleName, exact: true }) });
	const out: { start: number; end: number | null; latched: string }[] = [];
	for (const row of await rowsShown.all()) {
		const cells = row.getByRole('cell');
		const end = (await cells.nth(2).innerText()).trim();
		out.push({
			start: Number(await cells.nth(1).innerText()),
			end: /^[\d.]+$/.test(end) ? Number(end) : null,
			latched: (await cells.nth(5).innerText()).split('\n')[0].trim()
		});
	}
	return out;
}

function expectSameEvents(
	shown: { start: number; end: number | null; latched: string }[],
	expected: Expected[]
) {
	expect(shown.length).toBe(expected.length);
	shown.forEach((s, i) => {
		expect(s.start).toBeCloseTo(expected[i].start, 5); // shown to the microsecond
		if (expected[i].end === null) expect(s.end).toBeNull();
		else expect(s.end).toBeCloseTo(expected[i].end!, 5);
		expect(s.latched).toBe(expected[i].latched ? 'Yes' : 'No');
	});
}

test('an editor publishes two alert rules; a viewer replays them over the demo capture and sees the expected events', async ({
	browser
}) => {
	test.setTimeout(180_000);
	const throttleEvents = expectedEvents(throttle, 90, 10, false);
	const speedEvents = expectedEvents(speed, 150, 10, true);
	// The fixture must exercise both rules: several throttle events, a latched speed event.
	expect(throttleEvents.length).toBeGreaterThan(1);
	expect(speedEvents).toHaveLength(1);
	expect(speedEvents[0].latched).toBe(true);

	// ---- The editor adds two rules in the table and publishes them. ----
	const editorContext = await browser.newContext();
	const editor = await editorContext.newPage();
	await signIn(editor, 'calibrator@framewright.test');
	await editor.goto(`/w/${slug}/maps`);
	await editor.getByRole('link', { name: mapName }).first().click();
	await expect(editor.getByRole('heading', { level: 1, name: mapName })).toBeVisible();
	const rulesTable = editor.getByRole('table', { name: 'Alert rules' });
	const before = await rulesTable.getByTestId('alert-rule-row').count();

	await editor.getByRole('button', { name: 'Add alert rule' }).click();
	const a = before + 1;
	await setField(editor, `Rule ${a} name`, 'Throttle wide open');
	await editor
		.getByLabel(`Rule ${a} channel`)
		.selectOption({ label: 'EngineCore / ThrottlePosition' });
	await setField(editor, `Rule ${a} setpoint`, '90');
	await setField(editor, `Rule ${a} deadband`, '10');

	await editor.getByRole('button', { name: 'Add alert rule' }).click();
	const b = before + 2;
	await setField(editor, `Rule ${b} name`, 'Over-speed');
	await editor.getByLabel(`Rule ${b} channel`).selectOption({ label: 'Drivetrain / VehicleSpeed' });
	await setField(editor, `Rule ${b} setpoint`, '150');
	await setField(editor, `Rule ${b} deadband`, '10');
	await editor.getByLabel(`Rule ${b} severity`).selectOption({ label: 'Critical' });
	await editor.getByLabel(`Rule ${b} latching`).check();
	// A refused value is shown, explained and not applied.
	await setField(editor, `Rule ${b} on delay`, '-1');
	await expect(editor.getByText('Not applied: on-delay must be 0 or more seconds')).toBeVisible();
	await setField(editor, `Rule ${b} on delay`, '0');
	await expect(rulesTable.getByTestId('alert-rule-row')).toHaveCount(before + 2);

	await editor.getByRole('button', { name: 'Save draft' }).click();
	await expect(editor.getByText('Draft saved.')).toBeVisible();
	await editor.getByRole('button', { name: 'Publish…' }).click();
	await editor.getByLabel('Revision note').fill('Throttle and over-speed alerts for the test day.');
	await editor.getByRole('button', { name: /^Publish r\d+$/ }).click();
	await expect(editor.getByText(/^Published r\d+\./)).toBeVisible();
	await editorContext.close();

	// ---- The viewer uploads the demo capture, decodes it with the latest revision and replays the rules. ----
	const viewerContext = await browser.newContext();
	const page = await viewerContext.newPage();
	await signIn(page, 'tuner@framewright.test');
	// A viewer sees the rules but cannot edit them.
	await page.goto(`/w/${slug}/maps`);
	await page.getByRole('link', { name: mapName }).first().click();
	await expect(
		page
			.getByRole('table', { name: 'Alert rules' })
			.getByRole('cell', { name: 'Over-speed', exact: true })
	).toBeVisible();
	await expect(page.getByRole('button', { name: 'Add alert rule' })).toHaveCount(0);

	await page.goto(`/w/${slug}/captures`);
	await page.getByLabel('Choose capture files').setInputFiles(capturePath);
	await expect(page.getByRole('heading', { name: 'Confirm the layout' })).toBeVisible({
		timeout: 30_000
	});
	await page.getByRole('button', { name: 'Process capture' }).click();
	await expect(page.getByRole('heading', { name: 'Import report' })).toBeVisible({
		timeout: 60_000
	});

	const decodePanel = page.getByRole('region', { name: 'Decode', exact: true });
	await decodePanel.getByLabel('Map').selectOption({ label: mapName });
	const revision = decodePanel.getByLabel('Revision');
	const latest = (await revision.locator('option', { hasText: '(latest)' }).innerText()).split(
		' '
	)[0];
	await revision.selectOption({ label: `${latest} (latest)` });
	await decodePanel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${mapName} ${latest}`)).toBeVisible({
		timeout: 30_000
	});

	// Alerts are a panel of the workbench.
	await page.getByRole('tab', { name: 'Alerts' }).click();
	const alerts = page.getByRole('region', { name: 'Alert events' });
	await expect(alerts.getByRole('table', { name: 'Alert events' })).toBeVisible({
		timeout: 30_000
	});

	// The timeline: one span per expected event in each rule's lane.
	const timeline = alerts.getByRole('list', { name: 'Alert timeline' });
	await expect(
		timeline.getByRole('list', { name: 'Events of Throttle wide open' }).getByRole('listitem')
	).toHaveCount(throttleEvents.length);
	await expect(
		timeline.getByRole('list', { name: 'Events of Over-speed' }).getByRole('listitem')
	).toHaveCount(1);
	await expect(
		timeline.getByRole('listitem', {
			name: /^Critical Over-speed from [\d.]+ s to the end of the recording$/
		})
	).toBeVisible();

	// The events table: start, end and latching equal the hand replay of the fixture.
	expectSameEvents(await shownEvents(page, 'Throttle wide open'), throttleEvents);
	expectSameEvents(await shownEvents(page, 'Over-speed'), speedEvents);
	const summary = alerts.getByRole('table', { name: 'Alert summary per rule' });
	await expect(
		summary
			.getByRole('row', { name: /^Over-speed Critical/ })
			.getByRole('cell')
			.nth(2)
	).toHaveText('1');

	// Replay an acknowledgement 20 s in: the latched over-speed clears then, and the next excursion is a new event.
	const ackAt = 20;
	expect(speedEvents[0].start).toBeLessThan(ackAt);
	const speedRow = alerts
		.getByTestId('alert-event')
		.filter({ has: page.getByRole('rowheader', { name: 'Over-speed', exact: true }) });
	await speedRow.getByLabel('Acknowledge at (s)').fill(String(ackAt));
	await speedRow.getByRole('button', { name: 'Replay clearing' }).click();
	await expect(alerts.getByText('with 1 acknowledgement replayed')).toBeVisible();
	const afterAck = expectedEvents(speed, 150, 10, true, [ackAt]);
	expect(afterAck.length).toBeGreaterThan(1);
	expect(afterAck[0].end).toBe(ackAt);
	await expect(
		timeline.getByRole('list', { name: 'Events of Over-speed' }).getByRole('listitem')
	).toHaveCount(afterAck.length);
	expectSameEvents(await shownEvents(page, 'Over-speed'), afterAck);
	expect(recordingEnd).toBeGreaterThan(ackAt);
	await viewerContext.close();
});
