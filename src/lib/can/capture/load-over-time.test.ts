import { describe, expect, it } from 'vitest';
import { captureBusLoad } from '../busload';
import { referenceFdFrame } from '../testing/reference-fd-frame-bits';
import { referenceFrameBits } from '../testing/reference-frame-bits';
import { seededRandom } from '../testing/seeded-random';
import { FrameStore } from './frame-store';
import { loadOverTime } from './load-over-time';

/** A capture of random classical frames with an FD frame (12–64 bytes) every 50th. */
function randomCapture(seed: number) {
	const rand = seededRandom(seed);
	const store = new FrameStore();
	const frames: { time: number; id: number; extended: boolean; data: Uint8Array }[] = [];
	for (let i = 0; i < 3000; i++) {
		const extended = rand.int(0, 1) === 1;
		const id = extended ? rand.int(0, 0x1fffffff) : rand.int(0, 0x7ff);
		const fd = i % 50 === 7;
		const data = rand.bytes(fd ? rand.pick([12, 16, 20, 24, 32, 48, 64]) : rand.int(0, 8));
		const time = i * 1e-3 + rand.next() * 1e-4;
		store.add(time, id, extended, data, data.length);
		frames.push({ time, id, extended, data });
	}
	return { store, frames };
}

describe('loadOverTime', () => {
	it('sums each classical frame’s exact bus bits (bit-by-bit reference + 3 intermission)', () => {
		const { frames } = randomCapture(42);
		const classical = new FrameStore();
		for (const f of frames)
			if (f.data.length <= 8) classical.add(f.time, f.id, f.extended, f.data, f.data.length);
		// ISO 11898-1 frame + its stuff bits, counted one bit at a time; the intermission is 3 bits.
		const kept = frames.filter((f) => f.data.length <= 8);
		const expected = captureBusLoad(
			Float64Array.from(kept, (f) => f.time),
			Float64Array.from(kept, (f) => {
				const ref = referenceFrameBits(f.id, f.extended, f.data);
				return ref.bits + ref.stuffBits + 3;
			}),
			250_000,
			0.1
		);
		const result = loadOverTime(classical, 250_000, 0.1);
		expect(result.fdFrames).toBe(0);
		expect(result.windows).toEqual(expected);
		expect(result.peakPercent).toBe(Math.max(...expected.map((w) => w.percent)));
	});

	it.each([
		[undefined, false],
		[2_000_000, true]
	])(
		'counts CAN FD frames with their data phase at the data bit rate (data bit rate %s)',
		(dataBitrate, brs) => {
			const { store, frames } = randomCapture(7);
			const nominal = 500_000;
			const dataRate = dataBitrate ?? nominal;
			// Bus time per frame in seconds: classical frames from the ISO 11898-1 reference; FD frames
			// from the ISO 11898-1:2015 reference, BRS assumed exactly when a data bit rate is given.
			const seconds = frames.map((f) => {
				if (f.data.length <= 8) {
					const ref = referenceFrameBits(f.id, f.extended, f.data);
					return (ref.bits + ref.stuffBits + 3) / nominal;
				}
				const ref = referenceFdFrame(f.id, f.extended, f.data, brs);
				return (ref.arbitrationBits + 3) / nominal + ref.dataPhaseBits / dataRate;
			});
			const result = loadOverTime(store, nominal, 0.1, dataBitrate);
			expect(result).toMatchObject({
				fdFrames: 60,
				bitRateSwitch: brs,
				dataBitrate: dataRate
			});
			// Busy seconds per 0.1 s window, as a percentage.
			const first = Math.min(...frames.map((f) => f.time));
			const busy = new Array<number>(result.windows.length).fill(0);
			frames.forEach((f, i) => (busy[Math.floor((f.time - first) / 0.1)] += seconds[i]));
			expect(result.windows.map((w) => w.percent)).toEqual(
				busy.map((b) => expect.closeTo((100 * b) / 0.1, 9))
			);
		}
	);

	it('refuses a data bit rate below the nominal one', () => {
		const { store } = randomCapture(1);
		expect(() => loadOverTime(store, 500_000, 0.1, 250_000)).toThrow(/at least the nominal/);
	});

	it('gives no windows for an empty capture', () => {
		expect(loadOverTime(new FrameStore(), 500_000).windows).toEqual([]);
	});
});
