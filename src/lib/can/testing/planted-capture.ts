/**
 * Synthetic frames of one ID with planted fields, for the field-proposal tests and benchmark.
 * Every bit is written with the slow reference bit walk (reference-bits.ts) and checksums with the
 * bit-by-bit CRC (reference-crc8.ts), so nothing here shares code with the detectors it checks.
 */
import type { ByteOrder } from '../map';
import { referencePositions } from './reference-bits';
import { referenceCrc8 } from './reference-crc8';
import { seededRandom } from './seeded-random';

export type ChecksumAlgorithm = 'xor' | 'sum' | 'crc8-sae-j1850' | 'crc8-autosar';

export type PlantedField =
	| { kind: 'counter'; startBit: number; length: number; byteOrder: ByteOrder; step: number }
	| { kind: 'constant'; startBit: number; length: number; value: number }
	| { kind: 'noise'; startBit: number; length: number }
	/**
	 * A value driven by a random walk of its rate of change: each frame the rate moves by up to
	 * ±`accel` and is kept within ±`speed`; the value moves by the rate and bounces off the ends of
	 * its raw range (signed: two's complement), so it sweeps the whole range smoothly.
	 */
	| {
			kind: 'value';
			startBit: number;
			length: number;
			byteOrder: ByteOrder;
			signed: boolean;
			speed: number;
			accel: number;
			/** Raw range to stay in; default the whole range of the field. */
			range?: [number, number];
	  }
	/**
	 * Checksum byte over the other payload bytes in order (bytes 0 … L−1 without this one), with an
	 * optional data-ID byte fed first, and optionally with `clearedBits` read as 0.
	 */
	| {
			kind: 'checksum';
			byte: number;
			algorithm: ChecksumAlgorithm;
			dataId: number | null;
			clearedBits: number[];
	  }
	/** A selector cycling through `pages` in order; each page writes its own fields. */
	| {
			kind: 'mux';
			startBit: number;
			length: number;
			pages: { value: number; fields: PlantedField[] }[];
	  };

export interface PlantedSpec {
	seed: number;
	frames: number;
	payloadLength: number;
	/** Seconds between frames. */
	period: number;
	fields: PlantedField[];
}

const POLY: Record<string, number> = { 'crc8-sae-j1850': 0x1d, 'crc8-autosar': 0x2f };

/** Writes `raw` (least significant bit first) to the payload bits at `positions`. */
function writeBits(payload: Uint8Array, positions: number[], raw: number) {
	let rest = raw;
	for (const p of positions) {
		const byte = p >> 3;
		if (rest % 2) payload[byte] |= 1 << (p & 7);
		else payload[byte] &= ~(1 << (p & 7));
		rest = Math.floor(rest / 2);
	}
}

export function checksumOf(
	payload: Uint8Array,
	field: Extract<PlantedField, { kind: 'checksum' }>
): number {
	const input: number[] = [];
	if (field.dataId !== null) input.push(field.dataId);
	const copy = Uint8Array.from(payload);
	for (const p of field.clearedBits) copy[Math.floor(p / 8)] &= ~(1 << (p % 8));
	copy.forEach((b, i) => {
		if (i !== field.byte) input.push(b);
	});
	if (field.algorithm === 'xor') return input.reduce((a, b) => a ^ b, 0);
	if (field.algorithm === 'sum') return input.reduce((a, b) => a + b, 0) % 256;
	return referenceCrc8(input, POLY[field.algorithm], 0xff, 0xff);
}

/** Per-field state generator: returns the raw value for the next frame that carries the field. */
function fieldSource(field: PlantedField, rand: ReturnType<typeof seededRandom>) {
	switch (field.kind) {
		case 'counter': {
			let v = rand.int(0, 2 ** field.length - 1);
			return () => (v = (v + field.step) % 2 ** field.length);
		}
		case 'constant':
			return () => field.value;
		case 'noise':
			if (field.length > 32) throw new RangeError('plant noise in runs of at most 32 bits');
			return () => {
				let raw = 0;
				for (let i = 0, weight = 1; i < field.length; i++, weight *= 2) {
					if (rand.next() >= 0.5) raw += weight; // = rand.int(0, 1), one draw per bit
				}
				return raw;
			};
		case 'value': {
			const [lo, hi] = field.range ?? [
				field.signed ? -(2 ** (field.length - 1)) : 0,
				field.signed ? 2 ** (field.length - 1) - 1 : 2 ** field.length - 1
			];
			let x = lo + (hi - lo) * (0.3 + 0.4 * rand.next());
			let rate = 0;
			return () => {
				rate += (rand.next() * 2 - 1) * field.accel;
				rate = Math.max(-field.speed, Math.min(field.speed, rate));
				x += rate;
				if (x > hi) [x, rate] = [2 * hi - x, -rate];
				if (x < lo) [x, rate] = [2 * lo - x, -rate];
				const raw = Math.round(x);
				return raw < 0 ? raw + 2 ** field.length : raw;
			};
		}
		default:
			throw new Error(`no source for ${field.kind}`);
	}
}

export function plantedFrames(spec: PlantedSpec): { time: Float64Array; payloads: Uint8Array[] } {
	const rand = seededRandom(spec.seed);
	type Writer = (payload: Uint8Array, frame: number) => void;
	const writers: Writer[] = [];
	const checksums: Extract<PlantedField, { kind: 'checksum' }>[] = [];
	const writerFor = (field: PlantedField): Writer => {
		if (field.kind === 'mux') {
			const pages = field.pages.map((page) => ({
				value: page.value,
				writers: page.fields.map(writerFor)
			}));
			const selector = referencePositions(field.startBit, field.length, 'little');
			return (payload, frame) => {
				const page = pages[frame % pages.length];
				writeBits(payload, selector, page.value);
				for (const w of page.writers) w(payload, frame);
			};
		}
		if (field.kind === 'checksum') {
			checksums.push(field);
			return () => {};
		}
		const next = fieldSource(field, rand);
		const order = 'byteOrder' in field ? field.byteOrder : 'little';
		const positions = referencePositions(field.startBit, field.length, order);
		return (payload) => writeBits(payload, positions, next());
	};
	for (const field of spec.fields) writers.push(writerFor(field));

	const time = new Float64Array(spec.frames);
	const payloads: Uint8Array[] = [];
	for (let i = 0; i < spec.frames; i++) {
		time[i] = i * spec.period;
		const payload = new Uint8Array(spec.payloadLength);
		for (const w of writers) w(payload, i);
		for (const c of checksums) payload[c.byte] = checksumOf(payload, c);
		payloads.push(payload);
	}
	return { time, payloads };
}
