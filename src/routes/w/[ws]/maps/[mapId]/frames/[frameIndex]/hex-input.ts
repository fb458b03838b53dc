/**
 * Payload bytes typed by a person: "12 34 AB", "1234ab", "0x12,0x34", "12:34" all mean the same.
 * Errors say which piece is wrong so the box can explain it.
 */

/** Largest payload a frame can carry (CAN FD, ISO 11898-1). */
export const MAX_PAYLOAD_BYTES = 64;

export type HexBytesResult = { ok: true; bytes: Uint8Array } | { ok: false; message: string };

export function parseHexBytes(text: string): HexBytesResult {
	const tokens = text.split(/[\s,;:-]+/).filter(Boolean);
	const bytes: number[] = [];
	for (const token of tokens) {
		const digits = token.replace(/^0x/i, '');
		if (!/^[0-9a-f]+$/i.test(digits)) {
			return {
				ok: false,
				message: `"${token}" is not hex; use the digits 0–9 and A–F, e.g. 0A 1F`
			};
		}
		if (digits.length <= 2) {
			bytes.push(Number.parseInt(digits, 16));
			continue;
		}
		if (digits.length % 2 !== 0) {
			return {
				ok: false,
				message: `"${token}" has an odd number of hex digits; write each byte as two digits, e.g. 0A BC`
			};
		}
		for (let i = 0; i < digits.length; i += 2)
			bytes.push(Number.parseInt(digits.slice(i, i + 2), 16));
	}
	if (bytes.length > MAX_PAYLOAD_BYTES) {
		return {
			ok: false,
			message: `${bytes.length} bytes is more than a CAN payload can carry (at most ${MAX_PAYLOAD_BYTES})`
		};
	}
	return { ok: true, bytes: Uint8Array.from(bytes) };
}

/** "12 34 AB": upper case, two digits a byte, spaced — the form the payload box shows. */
export function formatHexBytes(bytes: Uint8Array): string {
	return Array.from(bytes, (b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');
}

/** The bytes resized to the frame's payload length: missing bytes read as 0, extra ones are dropped. */
export function fitPayload(bytes: Uint8Array, length: number): Uint8Array {
	const fitted = new Uint8Array(length);
	fitted.set(bytes.subarray(0, length));
	return fitted;
}
