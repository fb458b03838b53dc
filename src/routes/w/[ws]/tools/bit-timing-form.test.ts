import { describe, expect, it } from 'vitest';
import { bitTimingOptions } from '$lib/can/bit-timing';
import {
	BITRATE_PRESETS_KBPS,
	CLOCK_PRESETS_MHZ,
	explainSetting,
	formatBitrate,
	formatPercent,
	parseBitTimingForm,
	segmentsText
} from './bit-timing-form';

describe('parseBitTimingForm', () => {
	it('turns the form units (Hz, kbit/s, %) into the core request (Hz, bit/s, fraction)', () => {
		expect(
			parseBitTimingForm({ clockHz: ' 16000000 ', bitrateKbps: '500', samplePointPercent: '87.5' })
		).toEqual({
			ok: true,
			request: { clockHz: 16e6, bitrate: 500_000, samplePoint: 0.875 }
		});
		expect(
			parseBitTimingForm({ clockHz: '24000000', bitrateKbps: '83.333', samplePointPercent: '80' })
		).toEqual({
			ok: true,
			request: { clockHz: 24e6, bitrate: 83_333, samplePoint: 0.8 }
		});
	});

	it.each([
		[
			{ clockHz: '', bitrateKbps: '500', samplePointPercent: '87.5' },
			'clockHz',
			/Enter the controller clock/
		],
		[
			{ clockHz: '16 MHz', bitrateKbps: '500', samplePointPercent: '87.5' },
			'clockHz',
			/plain number/
		],
		[{ clockHz: '16', bitrateKbps: '500', samplePointPercent: '87.5' }, 'clockHz', /in Hz/],
		[
			{ clockHz: '16000000', bitrateKbps: '500000', samplePointPercent: '87.5' },
			'bitrateKbps',
			/kbit\/s/
		],
		[
			{ clockHz: '16000000', bitrateKbps: '0.5', samplePointPercent: '87.5' },
			'bitrateKbps',
			/at least 1/
		],
		[
			{ clockHz: '16000000', bitrateKbps: '500', samplePointPercent: '0.875' },
			'samplePointPercent',
			/percentage/
		],
		[
			{ clockHz: '16000000', bitrateKbps: '500', samplePointPercent: '-1' },
			'samplePointPercent',
			/plain number/
		]
	])('refuses %o with a message on %s', (input, field, message) => {
		const result = parseBitTimingForm(input);
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.errors[field as keyof typeof result.errors]).toMatch(message);
	});
});

describe('explainSetting (ISO 11898-1 bit time arithmetic)', () => {
	it('spells out 16 MHz at 500 kbit/s, 87.5 %: prescaler 2, 16 tq = 1 + 13 + 2', () => {
		// ISO 11898-1: sync segment 1 tq; 16 MHz / (2 × 16 tq) = 500 kbit/s; (1 + 13) / 16 = 87.5 %.
		const [best] = bitTimingOptions({ clockHz: 16e6, bitrate: 500_000, samplePoint: 0.875 });
		expect(segmentsText(best)).toBe('1 + 13 + 2');
		expect(explainSetting(16e6, best)).toBe(
			'16 MHz / (2 × 16 tq) = 500 kbit/s; sample point (1 + 13) / (1 + 13 + 2) = 87.5 %'
		);
	});

	const presets = CLOCK_PRESETS_MHZ.flatMap((mhz) =>
		BITRATE_PRESETS_KBPS.map((kbps) => ({ mhz, kbps }))
	);
	it.each(presets)(
		'$mhz MHz at $kbps kbit/s: the explained bit rate is the clock over prescaler × quanta',
		({ mhz, kbps }) => {
			const clockHz = mhz * 1e6;
			for (const t of bitTimingOptions({ clockHz, bitrate: kbps * 1000 }).slice(0, 5)) {
				// ISO 11898-1: bit time = (1 + tseg1 + tseg2) tq, tq = prescaler / clock.
				const achieved = clockHz / (t.prescaler * (1 + t.tseg1 + t.tseg2));
				expect(explainSetting(clockHz, t)).toContain(
					`= ${formatBitrate(Number(achieved.toFixed(3)))};`
				);
				expect(explainSetting(clockHz, t)).toContain(
					`= ${formatPercent((1 + t.tseg1) / t.timeQuanta)}`
				);
			}
		}
	);

	it('formats rates and percentages the way people say them', () => {
		expect(formatBitrate(1_000_000)).toBe('1 Mbit/s');
		expect(formatBitrate(125_000)).toBe('125 kbit/s');
		expect(formatBitrate(83_333)).toBe('83.333 kbit/s');
		expect(formatPercent(0.875)).toBe('87.5 %');
		expect(formatPercent(-0.0016, 2)).toBe('-0.16 %');
	});
});
