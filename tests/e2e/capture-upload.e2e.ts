// The capture API on the production build, as served by scripts/serve.js: a body far past
// adapter-node's 512 KB default goes through (BODY_SIZE_LIMIT lifted, our own limit applies), the
// bundled worker thread parses it, and the seeded demo captures are there, processed.
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

const api = '/api/workspaces/quillmoor-club-racing/captures';

/** An invented capture of `n` frames in the canonical layout; each row's bytes spell its index. */
function generatedCapture(n: number): string {
	const rows = ['time,id,extended,dlc,data'];
	for (let i = 0; i < n; i++) {
		const bytes = [i & 0xff, (i >> 8) & 0xff, (i >> 16) & 0xff, 0, 0, 0, 0, 0].map((b) =>
			b.toString(16).toUpperCase().padStart(2, '0')
		);
		rows.push(
			`${(i * 0.001).toFixed(6)},${(0x100 + (i % 16)).toString(16).toUpperCase()},0,8,${bytes.join(' ')}`
		);
	}
	return rows.join('\n') + '\n';
}

test('a viewer uploads a 2 MB capture, it is processed in the worker, and refusals are clear', async ({
	page
}) => {
	await signIn(page, 'tuner@framewright.test');

	const seeded = await page.request.get(api);
	expect(seeded.status()).toBe(200);
	const { captures } = (await seeded.json()) as { captures: { name: string; status: string }[] };
	// The seed's two captures are processed (other journeys may have uploaded more by now).
	const ready = captures.filter((c) => c.status === 'ready').map((c) => c.name);
	expect(ready).toEqual(expect.arrayContaining(['club-racer-session.csv', 'genset-idle.csv']));

	const frameCount = 50_000;
	const text = generatedCapture(frameCount);
	expect(text.length).toBeGreaterThan(2_000_000);
	const upload = await page.request.post(`${api}?name=generated.csv`, {
		data: Buffer.from(text),
		headers: { 'content-type': 'text/csv' }
	});
	expect(upload.status(), await upload.text()).toBe(201);
	const { capture, detected } = (await upload.json()) as {
		capture: { id: string; status: string };
		detected: { layout: unknown };
	};
	expect(capture.status).toBe('uploaded');

	const started = await page.request.post(`${api}/${capture.id}/process`, {
		data: { layout: detected.layout }
	});
	expect(started.status()).toBe(202);
	await expect
		.poll(
			async () =>
				(
					(await (await page.request.get(`${api}/${capture.id}/status`)).json()) as {
						status: string;
					}
				).status,
			{ timeout: 30_000 }
		)
		.toBe('ready');
	const detail = (await (await page.request.get(`${api}/${capture.id}`)).json()) as {
		capture: { frameCount: number; durationS: number };
		report: { badRowCount: number };
	};
	expect(detail.capture.frameCount).toBe(frameCount);
	expect(detail.capture.durationS).toBeCloseTo((frameCount - 1) * 0.001, 6);
	expect(detail.report.badRowCount).toBe(0);

	const binary = await page.request.post(`${api}?name=logger.bin`, {
		data: Buffer.alloc(10_000, 0),
		headers: { 'content-type': 'application/octet-stream' }
	});
	expect(binary.status()).toBe(415);
	expect(((await binary.json()) as { error: string }).error).toContain('binary data');

	const removed = await page.request.delete(`${api}/${capture.id}`);
	expect(removed.status()).toBe(204);
});
