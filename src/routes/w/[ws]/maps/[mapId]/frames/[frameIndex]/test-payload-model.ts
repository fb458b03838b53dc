/**
 * The test payload box as plain data: decode typed bytes into every signal's raw and physical
 * value, and encode a physical value into the bytes, reading it back for the round trip. All the
 * arithmetic is the core library's (`decodeFrame`, `encodeSignal`); this only shapes it for display.
 */
import { decodeFrame, decodeSignal, encodeSignal } from '$lib/can/codec';
import type { Frame } from '$lib/can/map';
import { fitPayload } from './hex-input';

/**
 * Physical values as a person reads them: 12 significant digits hide binary rounding of the scale
 * (3 × 0.1 is 0.30000000000000004 in IEEE 754 doubles) without hiding any real resolution.
 */
export function formatPhysical(value: number): string {
	if (!Number.isFinite(value)) return String(value);
	return String(Number(value.toPrecision(12)));
}

export type DecodedRow =
	| {
			name: string;
			unit: string;
			present: true;
			raw: string;
			physical: string;
			label: string | null;
			inRange: boolean;
	  }
	| { name: string; unit: string; present: false; reason: string };

export function decodeRows(frame: Pick<Frame, 'signals'>, bytes: Uint8Array): DecodedRow[] {
	let results: ReturnType<typeof decodeFrame>;
	try {
		results = decodeFrame(frame, bytes);
	} catch (error) {
		// e.g. a float signal of the wrong length: lint reports it; here every row says why.
		const reason = error instanceof Error ? error.message : 'cannot be decoded';
		return frame.signals.map((s) => ({ name: s.name, unit: s.unit, present: false, reason }));
	}
	return results.map((r, i) => {
		const { name, unit } = frame.signals[i];
		if (!r.present) {
			const reason =
				frame.signals[i].muxValue !== null
					? 'not on this multiplexer page, or past the payload'
					: 'its bits lie past the typed payload';
			return { name, unit, present: false, reason };
		}
		return {
			name,
			unit,
			present: true,
			raw: String(r.raw),
			physical: formatPhysical(r.value),
			label: r.label,
			inRange: r.inRange
		};
	});
}

export type EncodeOutcome =
	| {
			ok: true;
			bytes: Uint8Array;
			raw: bigint;
			clamped: boolean;
			outOfRange: boolean;
			readBack: string;
			label: string | null;
	  }
	| { ok: false; message: string };

/**
 * Writes `physicalText` into signal `index` of a copy of the payload (padded to the frame length,
 * other bits untouched) and decodes it again, so the person sees what a receiver would read.
 */
export function encodeInto(
	frame: Pick<Frame, 'signals' | 'length'>,
	index: number,
	bytes: Uint8Array,
	physicalText: string
): EncodeOutcome {
	const signal = frame.signals[index];
	const physical = Number(physicalText.trim());
	if (physicalText.trim() === '' || !Number.isFinite(physical)) {
		return { ok: false, message: `"${physicalText}" is not a number` };
	}
	const payload = fitPayload(bytes, Math.max(frame.length, bytes.length));
	try {
		const encoded = encodeSignal(signal, physical, payload);
		const back = decodeSignal(signal, payload);
		return {
			ok: true,
			bytes: payload,
			raw: encoded.raw,
			clamped: encoded.clamped,
			outOfRange: encoded.outOfRange,
			readBack: formatPhysical(back.value),
			label: back.label
		};
	} catch (error) {
		return { ok: false, message: error instanceof Error ? error.message : 'cannot be encoded' };
	}
}
