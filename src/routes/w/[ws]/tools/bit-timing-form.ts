/**
 * The bit-timing calculator's form: text as typed (clock in Hz, bit rate in kbit/s, sample point
 * in percent) → the core's request (Hz, bit/s, fraction), with messages in the form's own units.
 */
import { z } from 'zod';
import type { BitTiming, BitTimingRequest } from '$lib/can/bit-timing';

export const CLOCK_PRESETS_MHZ = [8, 16, 20, 24, 40, 80] as const;
export const BITRATE_PRESETS_KBPS = [125, 250, 500, 1000] as const;

const decimalText = (label: string, example: string) =>
	z
		.string()
		.trim()
		.min(1, `Enter the ${label}.`)
		.regex(/^\d+(\.\d+)?$/, `The ${label} must be a plain number, like ${example}.`)
		.transform(Number);

// The same bounds as the core's request schema, said in the form's units.
export const bitTimingFormSchema = z.object({
	clockHz: decimalText('controller clock', '16000000').pipe(
		z
			.number()
			.min(1000, 'The controller clock is in Hz: 16 MHz is 16000000.')
			.max(1e9, 'A CAN controller clock is at most 1 GHz (1000000000 Hz).')
	),
	bitrateKbps: decimalText('bit rate', '500').pipe(
		z
			.number()
			.min(1, 'The bit rate is in kbit/s and must be at least 1.')
			.max(8000, 'The bit rate is in kbit/s and must be at most 8000 (8 Mbit/s).')
			.refine(
				(k) => Number.isInteger(Math.round(k * 1e6) / 1e3),
				'Use at most three decimals (whole bits per second).'
			)
	),
	samplePointPercent: decimalText('sample point', '87.5').pipe(
		z
			.number()
			.min(50, 'The sample point is a percentage between 50 and 95.')
			.max(95, 'The sample point is a percentage between 50 and 95.')
	)
});
export type BitTimingFormInput = z.input<typeof bitTimingFormSchema>;
export type BitTimingField = keyof BitTimingFormInput;

export type BitTimingFormResult =
	| { ok: true; request: Required<BitTimingRequest> }
	| { ok: false; errors: Partial<Record<BitTimingField, string>> };

export function parseBitTimingForm(input: BitTimingFormInput): BitTimingFormResult {
	const parsed = bitTimingFormSchema.safeParse(input);
	if (!parsed.success) {
		const errors: Partial<Record<BitTimingField, string>> = {};
		for (const issue of parsed.error.issues) {
			const field = issue.path[0] as BitTimingField;
			errors[field] ??= issue.message;
		}
		return { ok: false, errors };
	}
	const { clockHz, bitrateKbps, samplePointPercent } = parsed.data;
	return {
		ok: true,
		request: {
			clockHz,
			bitrate: Math.round(bitrateKbps * 1000),
			samplePoint: samplePointPercent / 100
		}
	};
}

/** 16000000 → "16 MHz", 500000 → "500 kbit/s": the units people say out loud. */
export function formatHz(hz: number): string {
	if (hz >= 1e6 && hz % 1e3 === 0) return `${trim(hz / 1e6)} MHz`;
	if (hz >= 1e3) return `${trim(hz / 1e3)} kHz`;
	return `${trim(hz)} Hz`;
}

export function formatBitrate(bitsPerSecond: number): string {
	if (bitsPerSecond >= 1e6 && bitsPerSecond % 1e3 === 0)
		return `${trim(bitsPerSecond / 1e6)} Mbit/s`;
	if (bitsPerSecond >= 1e3) return `${trim(bitsPerSecond / 1e3)} kbit/s`;
	return `${trim(bitsPerSecond)} bit/s`;
}

/** A fraction as a percentage with up to `digits` decimals, trailing zeros dropped ("87.5 %"). */
export function formatPercent(fraction: number, digits = 3): string {
	return `${trim(Number((fraction * 100).toFixed(digits)))} %`;
}

function trim(n: number): string {
	return String(Number(n.toFixed(6)));
}

/** "1 + 13 + 2": sync segment, tseg1, tseg2 in time quanta (ISO 11898-1 bit time). */
export function segmentsText(t: BitTiming): string {
	return `1 + ${t.tseg1} + ${t.tseg2}`;
}

/**
 * The ISO 11898-1 arithmetic behind one setting, spelled out so it can be checked by hand:
 * bit rate = clock / (prescaler × quanta per bit), sample point = (1 + tseg1) / (1 + tseg1 + tseg2).
 */
export function explainSetting(clockHz: number, t: BitTiming): string {
	const achieved = clockHz / (t.prescaler * t.timeQuanta);
	return (
		`${formatHz(clockHz)} / (${t.prescaler} × ${t.timeQuanta} tq) = ${formatBitrate(Number(achieved.toFixed(3)))}; ` +
		`sample point (1 + ${t.tseg1}) / (1 + ${t.tseg1} + ${t.tseg2}) = ${formatPercent(t.samplePoint)}`
	);
}
