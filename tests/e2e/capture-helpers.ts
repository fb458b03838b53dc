import { readFileSync } from 'node:fs';
import { expect, type Page } from '@playwright/test';

export const DEMO_SLUG = 'quillmoor-club-racing';
export const GENSET_CSV = 'fixtures/genset-idle.csv';
export const GENSET_MAP = 'Generator set engine (J1939)';

/**
 * Uploads a capture through the API — a fixture file by path, or text made by the journey — with the
 * guessed layout, and waits until it is processed.
 */
export async function uploadAndProcess(
	page: Page,
	source: string | { name: string; data: string | Buffer } = GENSET_CSV,
	slug = DEMO_SLUG
): Promise<string> {
	const api = `/api/workspaces/${slug}/captures`;
	const { name, data } =
		typeof source === 'string'
			? { name: source.split('/').at(-1)!, data: readFileSync(source) }
			: source;
	const upload = await page.request.post(`${api}?name=${encodeURIComponent(name)}`, {
		data,
		headers: { 'content-type': 'text/csv' }
	});
	expect(upload.status()).toBe(201);
	const { capture, detected } = (await upload.json()) as {
		capture: { id: string };
		detected: { layout: unknown };
	};
	const process = await page.request.post(`${api}/${capture.id}/process`, {
		data: { layout: detected.layout }
	});
	expect(process.status()).toBe(202);
	await expect
		.poll(
			async () =>
				(
					(await (await page.request.get(`${api}/${capture.id}/status`)).json()) as {
						status: string;
					}
				).status,
			{ timeout: 60_000 }
		)
		.toBe('ready');
	return capture.id;
}

/** On the capture page: decodes with the map's latest revision from the Decodes panel. */
export async function decodeWithLatest(page: Page, mapName = GENSET_MAP): Promise<void> {
	await page.getByRole('tab', { name: 'Decodes' }).click();
	const panel = page.getByRole('region', { name: 'Decode', exact: true });
	await panel.getByLabel('Map').selectOption({ label: mapName });
	const revision = panel.getByLabel('Revision');
	const latest = (await revision.locator('option', { hasText: '(latest)' }).innerText()).trim();
	await revision.selectOption({ label: latest });
	await panel.getByRole('button', { name: 'Decode' }).click();
	await expect(page.getByText(`Showing the decode with ${mapName}`)).toBeVisible({
		timeout: 30_000
	});
}

/** Plots a decoded channel from the Channels panel (`Frame · Signal`). */
export async function plotChannel(page: Page, frameAndSignal: string): Promise<void> {
	await page.getByRole('tab', { name: 'Channels' }).click();
	await page.getByRole('button', { name: `Plot ${frameAndSignal}`, exact: true }).click();
	await expect(
		page.getByRole('list', { name: /^Channels on strip/ }).filter({
			hasText: frameAndSignal.split(' · ')[1]
		})
	).toBeVisible({ timeout: 20_000 });
}
