// This test runs only under Node (it measures the process heap), so Node built-ins are fine here.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import { ingestCapture } from './ingest';

// Streaming must not hold the whole text: a ~200 MB input arrives as 1 MB byte chunks from a
// generator and the JS heap (where text lives) must grow far less than the input size.
// The frames themselves go to typed arrays outside the JS heap (counted as arrayBuffers).
const TARGET_BYTES = 200 * 1024 * 1024;
const ROWS_PER_CHUNK = 8192;

/** A garbage collection on demand, so the samples measure what the import holds, not garbage. */
setFlagsFromString('--expose-gc');
const collectGarbage = runInNewContext('gc') as () => void;
const liveHeap = () => {
	collectGarbage();
	return process.memoryUsage().heapUsed;
};

/** One deterministic row of about 128 characters, padded with an ignored comment column. */
function row(i: number): string {
	const time = (i * 0.0005).toFixed(6);
	const id = (0x100 + (i % 40)).toString(16).toUpperCase();
	const byte = (k: number) => ((i * 7 + k * 13) & 0xff).toString(16).padStart(2, '0');
	const data = [0, 1, 2, 3, 4, 5, 6, 7].map(byte).join(' ');
	return `${time},${id},0,8,${data},bench-bus-0,${'x'.repeat(56)}\n`;
}

describe('capture ingest: large streamed input', () => {
	it('ingests ~200 MB with bounded memory', { timeout: 180_000 }, async () => {
		const encoder = new TextEncoder();
		let bytesSent = 0;
		let rowsSent = 0;
		let peakHeap = 0;
		const baseline = liveHeap();
		async function* chunks() {
			yield encoder.encode('time,id,extended,dlc,data,bus,comment\n');
			while (bytesSent < TARGET_BYTES) {
				let text = '';
				for (let k = 0; k < ROWS_PER_CHUNK; k++) text += row(rowsSent++);
				const bytes = encoder.encode(text);
				bytesSent += bytes.length;
				// Sampled while the import is suspended mid-stream: its pending text and parser state are live.
				if (rowsSent % (ROWS_PER_CHUNK * 16) === 0) peakHeap = Math.max(peakHeap, liveHeap());
				yield bytes;
			}
		}
		const result = await ingestCapture(chunks());
		peakHeap = Math.max(peakHeap, liveHeap());

		expect(bytesSent).toBeGreaterThanOrEqual(TARGET_BYTES);
		expect(result.frameCount).toBe(rowsSent);
		expect(result.badRowCount).toBe(0);
		expect(result.store.id[rowsSent - 1]).toBe(0x100 + ((rowsSent - 1) % 40));
		const heapGrowth = peakHeap - baseline;
		console.info(
			`streamed ${(bytesSent / 2 ** 20).toFixed(0)} MB, ${rowsSent} frames, peak live JS heap growth ${(heapGrowth / 2 ** 20).toFixed(1)} MB`
		);
		// Generous bound: under a quarter of the input (holding the text would need more than all of it).
		expect(heapGrowth).toBeLessThan(bytesSent / 4);
	});
});
