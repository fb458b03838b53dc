import { describe, expect, it } from 'vitest';
import {
	bitTimingOptions,
	MAX_BITRATE_ERROR,
	recommendedSamplePoint,
	TIMING_LIMITS
} from './bit-timing';

describe('bitTimingOptions (ISO 11898-1 bit time: 1 tq sync + tseg1 + tseg2)', () => {
	it('16 MHz, 500 kbit/s, 87.5 %: prescaler 2, 16 tq = 1 + 13 + 2 is best', () => {
		// ISO 11898-1 segment arithmetic: 16 MHz / 2 = 8 MHz tq clock, 8 MHz / 16 tq = 500 kbit/s,
		// sample point (1 + 13) / 16 = 0.875 — the usual textbook setting (from memory).
		const [best, second] = bitTimingOptions({
			clockHz: 16e6,
			bitrate: 500_000,
			samplePoint: 0.875
		});
		expect(best).toEqual({
			prescaler: 2,
			tseg1: 13,
			tseg2: 2,
			sjw: 2,
			timeQuanta: 16,
			samplePoint: 0.875,
			bitrateError: 0
		});
		// 8 tq (prescaler 4, 1 + 6 + 1) also hits 87.5 % exactly but has coarser quanta.
		expect(second).toMatchObject({
			prescaler: 4,
			timeQuanta: 8,
			tseg1: 6,
			tseg2: 1,
			samplePoint: 0.875
		});
	});

	it('defaults to the CiA recommended sample point (from memory): 87.5 % ≤ 500k, 80 % ≤ 800k, 75 % above', () => {
		expect(recommendedSamplePoint(250_000)).toBe(0.875);
		expect(recommendedSamplePoint(800_000)).toBe(0.8);
		expect(recommendedSamplePoint(1_000_000)).toBe(0.75);
		// 8 MHz at 1 Mbit/s: only 8 tq fit (prescaler 1); 1 + 5 + 2 gives exactly 75 %.
		expect(bitTimingOptions({ clockHz: 8e6, bitrate: 1_000_000 })[0]).toMatchObject({
			prescaler: 1,
			timeQuanta: 8,
			tseg1: 5,
			tseg2: 2,
			samplePoint: 0.75
		});
	});

	const clocks = [8e6, 16e6, 20e6, 24e6, 40e6, 80e6];
	const rates = [125_000, 250_000, 500_000, 1_000_000];
	const cases = clocks.flatMap((clockHz) => rates.map((bitrate) => ({ clockHz, bitrate })));
	it.each(cases)(
		'$clockHz Hz at $bitrate bit/s: every setting obeys the segment rules',
		({ clockHz, bitrate }) => {
			const options = bitTimingOptions({ clockHz, bitrate });
			expect(options.length).toBeGreaterThan(0);
			for (const o of options) {
				// ISO 11898-1: bit time = sync (1 tq) + tseg1 + tseg2; sample point at the end of tseg1.
				expect(1 + o.tseg1 + o.tseg2).toBe(o.timeQuanta);
				expect(o.samplePoint).toBeCloseTo((1 + o.tseg1) / o.timeQuanta, 12);
				// Common controller register ranges (common practice).
				expect(o.timeQuanta).toBeGreaterThanOrEqual(TIMING_LIMITS.timeQuanta.min);
				expect(o.timeQuanta).toBeLessThanOrEqual(TIMING_LIMITS.timeQuanta.max);
				expect(o.tseg1).toBeGreaterThanOrEqual(2);
				expect(o.tseg1).toBeLessThanOrEqual(16);
				expect(o.tseg2).toBeGreaterThanOrEqual(1);
				expect(o.tseg2).toBeLessThanOrEqual(8);
				// ISO 11898-1: SJW ≤ phase segment 2; common controllers: SJW ≤ 4.
				expect(o.sjw).toBeLessThanOrEqual(Math.min(4, o.tseg2));
				// Recompute the rate independently of the library.
				const actual = clockHz / (o.prescaler * o.timeQuanta);
				expect(o.bitrateError).toBeCloseTo((actual - bitrate) / bitrate, 12);
				expect(Math.abs(o.bitrateError)).toBeLessThanOrEqual(MAX_BITRATE_ERROR);
			}
			// All these clocks divide the four rates exactly, so the best setting has no error.
			expect(options[0].bitrateError).toBe(0);
			// Best first: error, then sample point distance, then more quanta.
			const wanted = recommendedSamplePoint(bitrate);
			for (let i = 1; i < options.length; i++) {
				const a = options[i - 1];
				const b = options[i];
				const key = (o: typeof a) => [
					Math.abs(o.bitrateError),
					Math.abs(o.samplePoint - wanted),
					-o.timeQuanta
				];
				const [ka, kb] = [key(a), key(b)];
				const order = ka[0] - kb[0] || ka[1] - kb[1] || ka[2] - kb[2];
				expect(order).toBeLessThanOrEqual(1e-9);
			}
		}
	);

	it('keeps inexact rates within 0.5 % and reports the error', () => {
		// 16 MHz / 33 333 bit/s = 480.005 clocks per bit: 480 (e.g. prescaler 20 × 24 tq) gives
		// 33 333.33 bit/s, an error of +1.0e-5; nothing exact exists.
		const options = bitTimingOptions({ clockHz: 16e6, bitrate: 33_333 });
		expect(options.length).toBeGreaterThan(0);
		for (const o of options) {
			const actual = 16e6 / (o.prescaler * o.timeQuanta);
			expect(Math.abs(actual / 33_333 - 1)).toBeLessThanOrEqual(0.005);
			expect(o.bitrateError).not.toBe(0);
		}
		expect(options[0].prescaler * options[0].timeQuanta).toBe(480);
		expect(options[0].bitrateError).toBeCloseTo(16e6 / 480 / 33_333 - 1, 11);
		// 11.0592 MHz at 500 kbit/s needs 22.1184 clocks per bit: 22 is +0.54 % — outside 0.5 %.
		expect(bitTimingOptions({ clockHz: 11.0592e6, bitrate: 500_000 })).toEqual([]);
	});

	it('returns no settings when the clock is too slow for the rate', () => {
		expect(bitTimingOptions({ clockHz: 4e6, bitrate: 1_000_000 })).toEqual([]);
	});

	it.each([
		[{ clockHz: -1, bitrate: 500_000 }, /clockHz must be positive/],
		[{ clockHz: 16e6, bitrate: 0 }, /bitrate must be at least/],
		[{ clockHz: 16e6, bitrate: 500_000, samplePoint: 87.5 }, /fraction, not percent/],
		[{ clockHz: Number.NaN, bitrate: 500_000 }, /clockHz/]
	])('rejects %o with a clear message', (request, message) => {
		expect(() => bitTimingOptions(request)).toThrow(message);
	});
});
