/**
 * Issue 14's "Done when": an editor opens an unknown ID of an uploaded capture, sees its proposed
 * fields over the bit activity, finds which field follows a chosen known channel, accepts the
 * proposals into the map's draft and decodes the capture again with them. The capture is made here
 * (src/lib/can/testing/planted-csv.ts, invented data): the unknown ID 0x3A1 carries a 4-bit counter
 * at bit 48, a CRC-8 SAE J1850 in byte 7 and a 16-bit little-endian value at bit 8 that the known
 * frame's ShaftSpeed carries as physical = 0.5 × raw + 25 — the expected answers are those planted
 * facts, not output of the code under test.
 */
import { expect, test, type Page } from '@playwright/test';
import {
	FOLLOW,
	followerCaptureCsv,
	followerMap,
	UNKNOWN_ID
} from '../../src/lib/can/testing/planted-csv';
import { uploadAndProcess } from './capture-helpers';
import { signIn, uniqueEmail } from './helpers';

const idText = `0x${UNKNOWN_ID.toString(16).toUpperCase()}`;

async function setUp(page: Page): Promise<{ slug: string; captureId: string }> {
	await signIn(page, uniqueEmail('calibrator'));
	await page.goto('/');
	await page.getByLabel('Workspace name').fill(`Field bench ${Date.now().toString(36)}`);
	await page.getByRole('button', { name: 'Create workspace' }).click();
	await expect(page).toHaveURL(/\/w\/[^/]+\/maps$/);
	const slug = new URL(page.url()).pathname.split('/')[2];
	const created = await page.request.post(`/api/workspaces/${slug}/maps`, {
		data: { mapJson: JSON.stringify(followerMap) }
	});
	expect(created.status()).toBe(201);

	const captureId = await uploadAndProcess(
		page,
		{ name: 'planted-follower.csv', data: followerCaptureCsv(3000) },
		slug
	);
	return { slug, captureId };
}

test('an editor finds the field that follows a known channel, accepts the proposals and decodes again', async ({
	page
}) => {
	test.setTimeout(180_000);
	const { slug, captureId } = await setUp(page);
	await page.goto(`/w/${slug}/captures/${captureId}`);

	// Decode with the map's draft (it has no published revision).
	await page.getByRole('tab', { name: 'Decodes' }).click();
	const decodePanel = page.getByRole('region', { name: 'Decode', exact: true });
	await decodePanel.getByLabel('Map').selectOption({ label: followerMap.name });
	await decodePanel.getByLabel('Revision').selectOption('draft');
	await decodePanel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${followerMap.name}`)).toBeVisible({
		timeout: 30_000
	});

	// The unknown ID's proposals over its bit activity.
	await page.getByRole('tab', { name: 'Unknown IDs' }).click();
	const unknown = page.getByRole('region', { name: 'Unknown IDs' });
	await unknown.getByRole('button', { name: `Bit activity of ${idText}` }).click();
	const proposals = unknown.getByRole('list', { name: `Proposed fields of ${idText}` });
	await expect(proposals).toBeVisible({ timeout: 30_000 });
	const counter = proposals.locator('li[data-kind="counter"][data-start-bit="48"]');
	await expect(counter).toContainText('step 1 modulo 16');
	await expect(proposals.locator('li[data-kind="checksum"][data-start-bit="56"]')).toContainText(
		'CRC-8 SAE J1850'
	);
	const value = proposals.locator('li[data-kind="value"][data-start-bit="8"]');
	await expect(value).toContainText('16 bits, little-endian');
	// Outlined in the grid: bit 48 carries the counter's mark, bit 8 the value's.
	const grid = unknown.getByRole('table', { name: new RegExp(`^Bit activity of ${idText}`) });
	await expect(grid.locator('[data-bit="48"]')).toHaveAttribute('data-field', /^C\d+$/);
	await expect(grid.locator('[data-bit="8"]')).toHaveAttribute('data-field', /^V\d+$/);

	// Which field follows ShaftSpeed? The planted one, with the planted scale and offset.
	await unknown
		.getByLabel('Known channel', { exact: true })
		.selectOption({ label: 'DriveStatus.ShaftSpeed (rpm)' });
	await unknown.getByRole('button', { name: 'Rank fields' }).click();
	const best = unknown.getByTestId('best-match');
	await expect(best).toContainText(`${idText} bits 8+16 little`, { timeout: 30_000 });
	await expect(best).toContainText(`raw × ${FOLLOW.scale} + ${FOLLOW.offset}`);
	await expect(unknown.getByRole('img', { name: /^Scatter plot: ShaftSpeed/ })).toBeVisible();
	await unknown
		.getByRole('button', { name: `Use ${idText} bits 8+16 little as ShaftSpeed` })
		.click();

	// The value takes the correlation's name, scale and offset; rename it and accept.
	await expect(value.getByLabel('Scale')).toHaveValue(String(FOLLOW.scale));
	await expect(value.getByLabel('Offset')).toHaveValue(String(FOLLOW.offset));
	// A 390 px phone: the open ID, its proposals and the ranking fit without sideways scrolling.
	const desktop = page.viewportSize()!;
	await page.setViewportSize({ width: 390, height: 844 });
	await expect
		.poll(() => page.evaluate(() => document.documentElement.scrollWidth))
		.toBeLessThanOrEqual(390);
	await page.setViewportSize(desktop);

	await value.getByLabel('Signal name').fill('FollowerSpeed');
	await counter.getByLabel('Signal name').fill('AliveCounter');
	// The frame goes to the decode's map unless another map of the workspace is chosen.
	const target = unknown.getByLabel('Add to the draft of');
	await expect(target.locator('option:checked')).toHaveText(
		`${followerMap.name} (this decode's map)`
	);
	await unknown.getByRole('button', { name: new RegExp(`^Accept \\d+ into the draft of`) }).click();
	await expect(
		unknown.getByRole('status').filter({ hasText: 'were added to the draft' })
	).toBeVisible();

	// Decode again with the draft: the new channels are there.
	await unknown.getByRole('button', { name: 'Decode again with the draft' }).click();
	await expect(page.getByRole('tab', { name: 'Channels', selected: true })).toBeVisible({
		timeout: 30_000
	});
	await expect(page.locator('[data-channel="Undocumented_0x3A1.FollowerSpeed"]')).toBeVisible();
	const alive = page.locator('[data-channel="Undocumented_0x3A1.AliveCounter"]');
	await expect(alive).toBeVisible();
	// The accepted counter and checksum are marked in words in the Channels table; the value is not.
	await expect(alive.getByRole('rowheader')).toHaveText(/^AliveCounter\s*counter$/);
	const newRows = page.locator('[data-channel^="Undocumented_0x3A1."]');
	await expect(
		newRows.filter({ has: page.getByRole('rowheader').filter({ hasText: /checksum$/ }) })
	).toHaveCount(1);
	await expect(
		page.locator('[data-channel="Undocumented_0x3A1.FollowerSpeed"]').locator('[data-role]')
	).toHaveCount(0);
});
