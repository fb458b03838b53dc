/**
 * Test support for the C code generator: a map covering every field shape, random test records, a C
 * program that runs the generated code over them in one batch, and the codec.ts answers to compare with.
 * Used only by tests.
 */
import {
	fieldBitPositions,
	fieldFits,
	fieldLayout,
	readFloatNumber,
	readIntegerNumber
} from '../bits';
import { decodeSignal, encodeSignal, rawBounds } from '../codec';
import type { GeneratedFrame } from '../codegen/generate';
import {
	canMapSchema,
	PAYLOAD_LENGTHS,
	type ByteOrder,
	type CanMap,
	type FrameInput,
	type Signal,
	type SignalInput,
	type ValueType
} from '../map';
import type { seededRandom } from './seeded-random';

type Random = ReturnType<typeof seededRandom>;

const SCALES = [1, 0.1, 0.125, -0.5, 0.001, 3, 1e-7, 2500, 0.0625, 1 / 3, -0.01];
const OFFSETS = [0, -40, 273.15, -1000.5, 0.01, 1e6, -0.25];

/**
 * Every integer length 1–64 in both byte orders, signed and unsigned, plus float32/float64 in both orders,
 * packed at random non-overlapping places into frames of every payload length 1–64 (classical and CAN FD).
 */
export function randomFieldFrames(rng: Random): FrameInput[] {
	const specs: { length: number; byteOrder: ByteOrder; valueType: ValueType }[] = [];
	for (const valueType of ['unsigned', 'signed'] as const)
		for (const byteOrder of ['little', 'big'] as const)
			for (let length = 1; length <= 64; length++) specs.push({ length, byteOrder, valueType });
	for (const byteOrder of ['little', 'big'] as const)
		for (let copy = 0; copy < 3; copy++) {
			specs.push({ length: 32, byteOrder, valueType: 'float32' });
			specs.push({ length: 64, byteOrder, valueType: 'float64' });
		}
	for (let i = specs.length - 1; i > 0; i--) {
		const j = rng.int(0, i);
		[specs[i], specs[j]] = [specs[j], specs[i]];
	}
	const lengths = PAYLOAD_LENGTHS.filter((n) => n > 0);
	const frames: FrameInput[] = [];
	let remaining = specs;
	for (let f = 0; remaining.length > 0; f++) {
		const length = lengths[f % lengths.length];
		const used = new Set<number>();
		const signals: SignalInput[] = [];
		remaining = remaining.filter((spec) => {
			if (signals.length >= 8) return true;
			for (let attempt = 0; attempt < 24; attempt++) {
				const startBit = rng.int(0, 8 * length - 1);
				if (!fieldFits(fieldLayout(startBit, spec.length, spec.byteOrder), length)) continue;
				const bits = fieldBitPositions(startBit, spec.length, spec.byteOrder);
				if (bits.some((b) => used.has(b))) continue;
				for (const b of bits) used.add(b);
				signals.push({
					name: `Field${f}_${signals.length}`,
					startBit,
					...spec,
					scale: rng.pick(SCALES),
					offset: rng.pick(OFFSETS)
				});
				return false;
			}
			return true;
		});
		if (signals.length) frames.push({ name: `Random${f}`, id: 0x100 + f, length, signals });
	}
	return frames;
}

/** Hand-made frames for multiplexing, edge placements and what the generator must leave out. */
export const SPECIAL_FRAMES: FrameInput[] = [
	{
		name: 'PagedClassic',
		id: '0x600',
		length: 8,
		signals: [
			{ name: 'Sel', startBit: 0, length: 2, multiplexer: true },
			{ name: 'Always', startBit: 2, length: 6, scale: 0.5 },
			{ name: 'P0Signed', startBit: 8, length: 12, valueType: 'signed', muxValue: 0, scale: 0.1 },
			{ name: 'P1Word', startBit: 24, length: 16, byteOrder: 'big', muxValue: 1, offset: -40 },
			{
				name: 'P1Float',
				startBit: 56,
				length: 32,
				byteOrder: 'big',
				valueType: 'float32',
				muxValue: 1
			},
			{ name: 'P2Odd', startBit: 13, length: 7, muxValue: 2, scale: 3, offset: 1 },
			{ name: 'P5Never', startBit: 40, length: 8, muxValue: 5 }
		]
	},
	{
		// The multiplexer sits after its page signals, is scaled, and is big-endian in byte 63.
		name: 'PagedFd',
		id: '0x18DA00F1',
		extended: true,
		length: 64,
		signals: [
			{ name: 'Wide0', startBit: 4, length: 64, valueType: 'signed', muxValue: 0, scale: 1e-3 },
			{ name: 'Wide1', startBit: 71, length: 64, byteOrder: 'big', muxValue: 1 },
			{ name: 'Double2', startBit: 137, length: 64, valueType: 'float64', muxValue: 2 },
			{ name: 'Last', startBit: 496, length: 4, byteOrder: 'big', scale: -2 },
			{ name: 'Selector', startBit: 504, length: 8, multiplexer: true, scale: 2, offset: 1 }
		]
	},
	{
		// Edge placements: a 64-bit field over 9 bytes both ways, 32 bits over 5 bytes, the last bit of the payload.
		name: 'Edges',
		id: '0x601',
		length: 20,
		signals: [
			{ name: 'Le64Over9', startBit: 3, length: 64, valueType: 'signed', offset: 5 },
			{ name: 'Be64Over9', startBit: 143, length: 64, byteOrder: 'big', scale: 0.25 },
			{ name: 'Le32Over5', startBit: 71, length: 32, valueType: 'signed' },
			{ name: 'LastBit', startBit: 159, length: 1 },
			{ name: 'BeByte0', startBit: 0, length: 1, byteOrder: 'big' }
		]
	},
	{
		// Left out or special: beyond the payload, wrong float length, a mux value without multiplexer, scale 0.
		name: 'Troubled',
		id: '0x602',
		length: 4,
		signals: [
			{ name: 'Fine', startBit: 0, length: 8 },
			{ name: 'TooFar', startBit: 28, length: 8 },
			{ name: 'BigOffByteZero', startBit: 2, length: 8, byteOrder: 'big' },
			{ name: 'ShortFloat', startBit: 8, length: 16, valueType: 'float32' },
			{ name: 'Orphan', startBit: 8, length: 4, muxValue: 1 },
			{ name: 'Frozen', startBit: 16, length: 8, scale: 0, offset: 7 }
		]
	},
	{ name: 'Empty', id: '0x603', length: 0 },
	{ name: 'NoSignals', id: '0x604', length: 8 }
];

export function compileTestMap(rng: Random): CanMap {
	return canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'Codegen test bench',
		frames: [...randomFieldFrames(rng), ...SPECIAL_FRAMES]
	});
}

// ---------------------------------------------------------------------------------------------------
// Records: payload, background bytes for encoding, and the physical values to encode, packed into one
// buffer per frame (the harness's input format) so that hundreds of thousands of records stay cheap.

export interface FrameRecords {
	count: number;
	/** payload (frame length), background (frame length), then one little-endian double per signal. */
	buffer: Uint8Array;
	payload(i: number): Uint8Array;
	background(i: number): Uint8Array;
	/** Values to encode, one per generated signal in the generated order. */
	values(i: number): number[];
}

/** Records per page (plus one share for undefined pages), so every page signal sees `perSignal` payloads. */
export function recordCount(gen: GeneratedFrame, map: CanMap, perSignal: number): number {
	const pages = pagesOf(gen, map);
	// 5 % spare for records whose encoding is refused (NaN or ±∞ among the values).
	return Math.ceil(perSignal * (pages === null ? 1.05 : (pages.length + 1) / 0.9));
}

function pagesOf(gen: GeneratedFrame, map: CanMap): number[] | null {
	if (!gen.page) return null;
	const frame = map.frames[gen.index];
	const values = gen.signals
		.map((s) => frame.signals[s.index].muxValue)
		.filter((v): v is number => v !== null);
	return [...new Set(values)].sort((a, b) => a - b);
}

const SPECIAL_VALUES = [0, -0, 5e-324, -5e-324, 1e-310, 1e300, -1e300, Number.MAX_VALUE];
const FRACTIONS = [0.5, -0.5, 0.49999999999, 0.5000000001];

/** A source of physical values for `signal`, chosen to reach rounding ties, clamping, overflow and subnormals. */
function physicalValues(signal: Signal, rng: Random) {
	const { lo: bigLo, hi: bigHi } = rawBounds(signal);
	const [lo, hi] = [Number(bigLo), Number(bigHi)];
	const float = signal.valueType === 'float32' || signal.valueType === 'float64';
	// Uniform enough over the raw range for choosing test values (exact integers up to 2^53).
	const randomRaw = () =>
		float
			? (rng.next() - 0.5) * 2 ** rng.int(-30, 140)
			: Math.floor(lo + rng.next() * (hi - lo + 1));
	const physical = (raw: number) => raw * signal.scale + signal.offset;
	const scratch = new DataView(new ArrayBuffer(8));
	return (payloadValue: () => number): number => {
		const pick = rng.next();
		if (pick < 0.3) return payloadValue();
		if (pick < 0.55) {
			const fraction = rng.next() < 0.8 ? rng.pick(FRACTIONS) : rng.next() - 0.5;
			return physical(randomRaw() + fraction);
		}
		if (pick < 0.7)
			return physical((rng.next() < 0.5 ? lo : hi) + (rng.next() < 0.5 ? -1 : 1) * rng.int(1, 5));
		if (pick < 0.8) return rng.pick(SPECIAL_VALUES) * (rng.next() < 0.5 ? -1 : 1);
		if (pick < 0.9) {
			// any finite double: a random bit pattern
			scratch.setUint32(0, rng.int(0, 0xffffffff));
			scratch.setUint32(4, rng.int(0, 0xffffffff));
			const value = scratch.getFloat64(0);
			return Number.isFinite(value) ? value : 1;
		}
		return physical(randomRaw());
	};
}

/** Insert an unsigned raw value into `data` by value bits (the multiplexer of a test record). */
function setBits(
	data: Uint8Array,
	startBit: number,
	length: number,
	order: ByteOrder,
	raw: number
) {
	fieldBitPositions(startBit, length, order).forEach((bit, i) => {
		const on = Math.floor(raw / 2 ** i) % 2 === 1;
		data[bit >> 3] = on ? data[bit >> 3] | (1 << (bit & 7)) : data[bit >> 3] & ~(1 << (bit & 7));
	});
}

export function makeRecords(
	gen: GeneratedFrame,
	map: CanMap,
	count: number,
	rng: Random
): FrameRecords {
	const frame = map.frames[gen.index];
	const L = frame.length;
	const pages = pagesOf(gen, map);
	const muxSignal = gen.page ? frame.signals.find((s) => s.multiplexer)! : null;
	const signals = gen.signals.map((g) => frame.signals[g.index]);
	const sources = signals.map((signal) => physicalValues(signal, rng));
	const size = 2 * L + 8 * signals.length;
	const buffer = new Uint8Array(size * count);
	const view = new DataView(buffer.buffer);
	const payload = (i: number) => buffer.subarray(i * size, i * size + L);
	const values = new Array<number>(signals.length);
	for (let i = 0; i < count; i++) {
		const at = i * size;
		for (let b = 0; b < 2 * L; b += 4) {
			if (b + 4 <= 2 * L) view.setUint32(at + b, rng.int(0, 0xffffffff));
			else for (let j = b; j < 2 * L; j++) buffer[at + j] = rng.int(0, 255);
		}
		const data = payload(i);
		let page: number | null = null;
		// 90 %: cycle through the defined pages; otherwise whatever the random bytes say.
		if (pages && muxSignal && rng.next() < 0.9) {
			page = pages[i % pages.length];
			setBits(data, muxSignal.startBit, muxSignal.length, muxSignal.byteOrder, page);
		}
		signals.forEach((signal, k) => {
			values[k] =
				signal === muxSignal && page !== null && rng.next() < 0.9
					? page * signal.scale + signal.offset // select the page when encoding too
					: sources[k](() => payloadValue(signal, data));
		});
		// About 1 % of records carry a NaN or an infinity, which the encoder must refuse.
		if (values.length && rng.next() < 0.01)
			values[rng.int(0, values.length - 1)] = rng.pick([Number.NaN, Infinity, -Infinity]);
		values.forEach((v, k) => view.setFloat64(at + 2 * L + 8 * k, v, true));
	}
	return {
		count,
		buffer,
		payload,
		background: (i) => buffer.subarray(i * size + L, i * size + 2 * L),
		values: (i) => signals.map((_, k) => view.getFloat64(i * size + 2 * L + 8 * k, true))
	};
}

/** The physical value the payload carries, as a test input (not a check value). */
function payloadValue(signal: Signal, data: Uint8Array): number {
	const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
	const raw =
		signal.valueType === 'float32' || signal.valueType === 'float64'
			? readFloatNumber(data, 0, layout)
			: readIntegerNumber(data, 0, layout, signal.valueType === 'signed');
	return raw * signal.scale + signal.offset;
}

// ---------------------------------------------------------------------------------------------------
// The C harness.

/**
 * A C program that reads the records of every frame from stdin and writes, per record: decode's result
 * with the full and a one-byte-short length, the page member, each signal's decoded double (0xFF bytes
 * where decode left it alone) and unpacked raw value, encode's result with a short length (and whether
 * the buffer stayed untouched), encode's result and the encoded bytes. Everything little-endian.
 */
export function harnessSource(prefix: string, frames: GeneratedFrame[], counts: number[]): string {
	const lines = [
		'#include <stdio.h>',
		'#include <stdlib.h>',
		'#include <string.h>',
		`#include "${prefix}.h"`,
		'',
		'static void put_u64(uint64_t v) { int i; for (i = 0; i < 8; i++) putchar((int)((v >> (8 * i)) & 0xFF)); }',
		'static void put_double(double d) { uint64_t v; memcpy(&v, &d, 8); put_u64(v); }',
		'static void get_bytes(uint8_t *p, size_t n) { if (n && fread(p, 1, n, stdin) != n) { fprintf(stderr, "short input\\n"); exit(3); } }',
		'static double get_double(void) { uint8_t b[8]; uint64_t v = 0; int i; double d; get_bytes(b, 8); for (i = 7; i >= 0; i--) v = (v << 8) | b[i]; memcpy(&d, &v, 8); return d; }'
	];
	frames.forEach((g, f) => {
		const L = `${g.typeName.replace(/_t$/, '').toUpperCase()}_LENGTH`;
		const body = [
			`static void run_${f}(long n)`,
			'{',
			`\tuint8_t payload[${L} + 1], work[${L} + 1], spare[${L} + 1];`,
			`\t${g.typeName} s;`,
			'\tlong i;',
			'\tint rc;',
			'\tfor (i = 0; i < n; i++) {',
			`\t\tget_bytes(payload, ${L});`,
			`\t\tget_bytes(work, ${L});`,
			'\t\tmemset(&s, 0xFF, sizeof s);',
			`\t\trc = ${g.decode}(payload, ${L}, &s);`,
			'\t\tputchar(rc & 0xFF);',
			`\t\trc = ${L} > 0 ? ${g.decode}(payload, (uint8_t)(${L} - 1), &s) : 0;`,
			'\t\tputchar(rc & 0xFF);'
		];
		if (g.page) body.push(`\t\tput_u64((uint64_t)s.${g.page.member});`);
		for (const s of g.signals)
			body.push(`\t\tput_double(s.${s.member});`, `\t\tput_u64((uint64_t)${s.unpack}(payload));`);
		for (const s of g.signals) body.push(`\t\ts.${s.member} = get_double();`);
		// encode must ignore the page member: give it a value decode would never have written
		if (g.page) body.push(`\t\ts.${g.page.member} = (${g.page.type})(s.${g.page.member} + 1);`);
		body.push(
			`\t\tmemcpy(spare, work, ${L} + 1);`,
			`\t\trc = ${L} > 0 ? ${g.encode}(&s, spare, (uint8_t)(${L} - 1)) : -1;`,
			'\t\tputchar(rc & 0xFF);',
			`\t\tputchar(memcmp(spare, work, ${L}) == 0);`,
			`\t\trc = ${g.encode}(&s, work, ${L});`,
			'\t\tput_u64((uint64_t)(int64_t)rc);',
			`\t\tfor (rc = 0; rc < ${L}; rc++) putchar(work[rc]);`,
			'\t}',
			'}'
		);
		lines.push('', ...body);
	});
	lines.push(
		'',
		'int main(void)',
		'{',
		...frames.map((_, f) => `\trun_${f}(${counts[f]}L);`),
		'\treturn 0;',
		'}'
	);
	return `${lines.join('\n')}\n`;
}

// ---------------------------------------------------------------------------------------------------
// What codec.ts says.

/**
 * The frame-level encoding rule of the generated code, built from codec.ts's encodeSignal: refuse NaN
 * or ±∞ (payload untouched); the multiplexer's encoded raw value picks the page; then each signal with
 * a non-zero scale on that page is encoded in map order. Returns the number of clamped values or −2.
 */
export function referenceEncode(
	gen: GeneratedFrame,
	map: CanMap,
	values: number[],
	data: Uint8Array
): { result: number; written: number[] } {
	const frame = map.frames[gen.index];
	const signals = gen.signals.map((g) => frame.signals[g.index]);
	const muxAt = signals.findIndex((s) => s.multiplexer);
	const refused = { result: -2, written: [] };
	let page: number | null = null;
	if (gen.page && muxAt >= 0 && signals[muxAt].scale !== 0) {
		if (!Number.isFinite(values[muxAt])) return refused;
		const scratch = new Uint8Array(frame.length);
		encodeSignal(signals[muxAt], values[muxAt], scratch);
		page = Number(decodeSignal(signals[muxAt], scratch).raw);
	}
	const written = signals
		.map((signal, k) => ({ signal, value: values[k], k }))
		.filter(
			({ signal }) => signal.scale !== 0 && (signal.muxValue === null || signal.muxValue === page)
		);
	if (written.some(({ value }) => !Number.isFinite(value))) return refused;
	let clamped = 0;
	for (const { signal, value } of written) {
		if (encodeSignal(signal, value, data).clamped) clamped++;
	}
	return { result: clamped, written: written.map((w) => w.k) };
}
