/**
 * SAE J1939 helpers: 29-bit identifier layout (J1939-21), "not available"/"error" value ranges
 * (J1939-71) and diagnostic message DM1 (J1939-73). The transport protocol (BAM and RTS/CTS,
 * J1939-21) is in j1939-transport.ts. Pure: runs in the browser, the server and the CLI alike.
 */
import { z } from 'zod';
import { MAX_EXTENDED_ID } from './map';

/** PF values below this are PDU1 (PS = destination address); from it on PDU2 (PS = group extension). J1939-21. */
export const PDU2_THRESHOLD = 240;
/** The global (broadcast) destination address. J1939-21. */
export const GLOBAL_ADDRESS = 0xff;
/** A PGN is 18 bits: EDP, DP, PF (8), PS (8). J1939-21. */
export const MAX_PGN = 0x3ffff;

export interface J1939Id {
	priority: number;
	/** Extended data page (bit 25); 0 for J1939 messages, 1 with DP = 1 is ISO 15765-3. */
	edp: number;
	/** Data page (bit 24). */
	dp: number;
	/** PDU format (bits 23–16). */
	pf: number;
	/** PDU specific (bits 15–8): destination address (PDU1) or group extension (PDU2). */
	ps: number;
	sourceAddress: number;
	/** Parameter group number: EDP, DP, PF and — for PDU2 only — PS. */
	pgn: number;
	/** PDU1 destination address; null for PDU2 (broadcast by definition). */
	destinationAddress: number | null;
}

/**
 * Splits a 29-bit identifier into its J1939-21 fields:
 * priority (bits 28–26), EDP (25), DP (24), PF (23–16), PS (15–8), source address (7–0).
 */
export function parseJ1939Id(id: number): J1939Id {
	if (!Number.isInteger(id) || id < 0 || id > MAX_EXTENDED_ID) {
		throw new RangeError(`J1939 ID must be an integer 0…0x1FFFFFFF, got ${id}`);
	}
	// Division instead of >>> keeps this readable for the top bits and avoids sign surprises.
	const priority = Math.floor(id / 0x4000000) & 0x7;
	const edp = (id >>> 25) & 1;
	const dp = (id >>> 24) & 1;
	const pf = (id >>> 16) & 0xff;
	const ps = (id >>> 8) & 0xff;
	const sourceAddress = id & 0xff;
	const pdu1 = pf < PDU2_THRESHOLD;
	const pgn = (edp << 17) | (dp << 16) | (pf << 8) | (pdu1 ? 0 : ps);
	return {
		priority,
		edp,
		dp,
		pf,
		ps,
		sourceAddress,
		pgn,
		destinationAddress: pdu1 ? ps : null
	};
}

/** PGN of a parsed or raw ID, the key by which J1939 frames match whatever their priority or sender. */
export function j1939Pgn(id: number): number {
	return parseJ1939Id(id).pgn;
}

/** Whether a PGN is PDU1 (addressable: its PS byte carries a destination address). */
export function isPdu1(pgn: number): boolean {
	return ((pgn >>> 8) & 0xff) < PDU2_THRESHOLD;
}

const byteSchema = (what: string) =>
	z
		.number({ error: `${what} must be a number` })
		.int(`${what} must be an integer`)
		.min(0, `${what} must be 0…255`)
		.max(255, `${what} must be 0…255`);

export const j1939IdPartsSchema = z
	.object({
		priority: z.number().int().min(0, 'priority must be 0…7').max(7, 'priority must be 0…7'),
		pgn: z.number().int().min(0, 'PGN must be 0…0x3FFFF').max(MAX_PGN, 'PGN must be 0…0x3FFFF'),
		sourceAddress: byteSchema('source address'),
		destinationAddress: byteSchema('destination address').nullable().optional()
	})
	.superRefine((parts, ctx) => {
		if (isPdu1(parts.pgn)) {
			if ((parts.pgn & 0xff) !== 0) {
				ctx.addIssue({
					code: 'custom',
					path: ['pgn'],
					message:
						`PDU1 PGN 0x${parts.pgn.toString(16).toUpperCase()} (PF < 240) must have a zero low byte: ` +
						'its PS byte is the destination address, given separately'
				});
			}
		} else if (parts.destinationAddress != null) {
			ctx.addIssue({
				code: 'custom',
				path: ['destinationAddress'],
				message: 'PDU2 PGNs (PF ≥ 240) are broadcast and carry no destination address'
			});
		}
	});
export type J1939IdParts = z.input<typeof j1939IdPartsSchema>;

/**
 * Inverse of parseJ1939Id. For a PDU1 PGN a missing destination address means global (0xFF).
 * Throws a RangeError naming the bad field on nonsense input.
 */
export function buildJ1939Id(parts: J1939IdParts): number {
	const checked = j1939IdPartsSchema.safeParse(parts);
	if (!checked.success) {
		const issue = checked.error.issues[0];
		const where = issue.path.length ? `${issue.path.join('.')}: ` : '';
		throw new RangeError(`Cannot build J1939 ID — ${where}${issue.message}`);
	}
	const { priority, pgn, sourceAddress, destinationAddress } = checked.data;
	const ps = isPdu1(pgn) ? (destinationAddress ?? GLOBAL_ADDRESS) : pgn & 0xff;
	// Multiplication keeps the result a positive number (priority 7 would set bit 28..31 via <<).
	return priority * 0x4000000 + (pgn & 0x3ff00) * 0x100 + ps * 0x100 + sourceAddress;
}

export type J1939ValueStatus = 'valid' | 'notAvailable' | 'error' | 'reserved';

/**
 * Classifies a raw parameter value by the SAE J1939-71 transmitted-value ranges.
 * `length` is the parameter's size in bits; `raw` its bit pattern (a negative two's-complement
 * value is read as the same bit pattern). Ranges (recalled from memory, J1939-71 "Parameter ranges"):
 * - 8 bits: 0x00–0xFA valid, 0xFB parameter-specific indicator, 0xFC–0xFD reserved,
 *   0xFE error, 0xFF not available
 * - 16 bits: 0x0000–0xFAFF valid, 0xFB00–0xFBFF parameter-specific, 0xFC00–0xFDFF reserved,
 *   0xFE00–0xFEFF error, 0xFF00–0xFFFF not available
 * - 32 bits: 0–0xFAFFFFFF valid, 0xFBxxxxxx parameter-specific, 0xFC–0xFDxxxxxx reserved,
 *   0xFExxxxxx error, 0xFFxxxxxx not available
 * - 2-bit discrete: 0–1 valid, 2 error, 3 not available
 * - 4-bit discrete: 0–13 valid, 14 error, 15 not available
 * The parameter-specific and reserved bands are both reported as 'reserved'.
 * Other lengths (e.g. 3-byte, 12-bit) have no rule here and are 'valid'.
 */
export function j1939ValueStatus(raw: number, length: number): J1939ValueStatus {
	if (!Number.isInteger(raw)) {
		throw new RangeError(`J1939 raw value must be an integer, got ${raw}`);
	}
	switch (length) {
		case 2:
			return discreteStatus(mod(raw, 4), 2);
		case 4:
			return discreteStatus(mod(raw, 16), 14);
		case 8:
			return rangeStatus(mod(raw, 0x100));
		case 16:
			return rangeStatus(Math.floor(mod(raw, 0x10000) / 0x100));
		case 32:
			return rangeStatus(Math.floor(mod(raw, 0x100000000) / 0x1000000));
		default:
			return 'valid';
	}
}

/** Non-negative remainder: a signed raw value becomes its unsigned bit pattern. */
function mod(value: number, modulus: number): number {
	return ((value % modulus) + modulus) % modulus;
}

/** Discrete parameters: the top value is "not available", the one below it "error". */
function discreteStatus(value: number, errorValue: number): J1939ValueStatus {
	if (value === errorValue + 1) return 'notAvailable';
	if (value === errorValue) return 'error';
	return 'valid';
}

/** Byte-wise parameters are classified by their most significant byte. */
function rangeStatus(topByte: number): J1939ValueStatus {
	if (topByte <= 0xfa) return 'valid';
	if (topByte === 0xfe) return 'error';
	if (topByte === 0xff) return 'notAvailable';
	return 'reserved';
}

// ---------------------------------------------------------------------------------------------
// DM1 — active diagnostic trouble codes (SAE J1939-73)

/**
 * Caution for any place that shows DM1 lamps or trouble codes: the codes say what a controller
 * reports, not what to do about it.
 */
export const DM1_CAUTION =
	'Lamp states and trouble codes are as reported by the sending controller. What a code means and ' +
	'whether the vehicle may keep running is defined by the vehicle or engine maker’s service ' +
	'documentation — a red stop lamp means stop safely and consult it.';

/** PGN 65226 (0xFECA): DM1, active diagnostic trouble codes. SAE J1939-73. */
export const PGN_DM1 = 0xfeca;

export const lampStateSchema = z.enum(['off', 'on', 'reserved', 'notAvailable']);
export type LampState = z.infer<typeof lampStateSchema>;
// J1939-73 flash codes (from memory): 00 slow (1 Hz), 01 fast (2 Hz), 10 reserved, 11 do not flash.
export const lampFlashSchema = z.enum(['slow', 'fast', 'reserved', 'none']);
export type LampFlash = z.infer<typeof lampFlashSchema>;
export const lampSchema = z.object({ state: lampStateSchema, flash: lampFlashSchema });
export type Lamp = z.infer<typeof lampSchema>;
export const dm1LampsSchema = z.object({
	malfunctionIndicator: lampSchema,
	redStop: lampSchema,
	amberWarning: lampSchema,
	protect: lampSchema
});
export type Dm1Lamps = z.infer<typeof dm1LampsSchema>;
export interface TroubleCode {
	/** Suspect parameter number, 19 bits. */
	spn: number;
	/** Failure mode identifier, 5 bits. */
	fmi: number;
	/** Occurrence count, 7 bits (127 = not available). */
	occurrenceCount: number;
	/** SPN conversion method bit: 0 = version 4 layout (the one decoded here), 1 = an older layout. */
	conversionMethod: number;
}
export interface Dm1 {
	lamps: Dm1Lamps;
	troubleCodes: TroubleCode[];
}

const LAMP_STATES = lampStateSchema.options;
const LAMP_FLASHES = lampFlashSchema.options;

function lamp(status: number, flash: number, shift: number): Lamp {
	return { state: LAMP_STATES[(status >> shift) & 3], flash: LAMP_FLASHES[(flash >> shift) & 3] };
}

/**
 * Decodes a DM1 payload (SAE J1939-73): byte 0 lamp status (bits 8–7 malfunction indicator,
 * 6–5 red stop, 4–3 amber warning, 2–1 protect; J1939 numbers bits 1…8 from the LSB), byte 1
 * the matching flash codes, then 4-byte DTCs: SPN low 8 bits, SPN next 8 bits, SPN top 3 bits
 * in bits 8–6 with FMI in bits 5–1, then CM (bit 8) and occurrence count (bits 7–1).
 * Works on a single 8-byte frame or on a BAM-reassembled payload. An all-zero DTC slot means
 * "no active fault" and all-0xFF slots are padding; both are skipped.
 */
export function parseDm1(data: Uint8Array): Dm1 {
	if (data.length < 2) {
		throw new RangeError(`DM1 needs at least the 2 lamp bytes, got ${data.length} byte(s)`);
	}
	const status = data[0];
	const flash = data[1];
	const lamps: Dm1Lamps = {
		malfunctionIndicator: lamp(status, flash, 6),
		redStop: lamp(status, flash, 4),
		amberWarning: lamp(status, flash, 2),
		protect: lamp(status, flash, 0)
	};
	const troubleCodes: TroubleCode[] = [];
	for (let at = 2; at + 4 <= data.length; at += 4) {
		const [b0, b1, b2, b3] = data.subarray(at, at + 4);
		const empty = (b0 | b1 | b2 | b3) === 0;
		const padding = (b0 & b1 & b2 & b3) === 0xff;
		if (empty || padding) continue;
		troubleCodes.push({
			spn: b0 | (b1 << 8) | ((b2 >> 5) << 16),
			fmi: b2 & 0x1f,
			conversionMethod: b3 >> 7,
			occurrenceCount: b3 & 0x7f
		});
	}
	return { lamps, troubleCodes };
}

/** Builds a DM1 payload from trouble codes — the inverse of parseDm1 (for tests, demos, simulators). */
export function encodeDm1(lamps: Dm1Lamps, troubleCodes: readonly TroubleCode[]): Uint8Array {
	const bits = (pick: (l: Lamp) => number) =>
		(pick(lamps.malfunctionIndicator) << 6) |
		(pick(lamps.redStop) << 4) |
		(pick(lamps.amberWarning) << 2) |
		pick(lamps.protect);
	// A DM1 without faults still carries one all-zero DTC slot, padded to 8 bytes (J1939-73, from memory).
	const slots = Math.max(troubleCodes.length, 1);
	const out = new Uint8Array(Math.max(2 + 4 * slots, 8)).fill(0xff);
	out[0] = bits((l) => LAMP_STATES.indexOf(l.state));
	out[1] = bits((l) => LAMP_FLASHES.indexOf(l.flash));
	if (troubleCodes.length === 0) out.fill(0, 2, 6);
	troubleCodes.forEach((code, i) => {
		if (code.spn < 0 || code.spn > 0x7ffff || code.fmi < 0 || code.fmi > 31) {
			throw new RangeError(`DTC ${i}: SPN must be 0…524287 and FMI 0…31`);
		}
		const at = 2 + 4 * i;
		out[at] = code.spn & 0xff;
		out[at + 1] = (code.spn >> 8) & 0xff;
		out[at + 2] = ((code.spn >> 16) << 5) | code.fmi;
		out[at + 3] = ((code.conversionMethod & 1) << 7) | (code.occurrenceCount & 0x7f);
	});
	return out;
}
