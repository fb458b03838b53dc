/**
 * C99 code for firmware from a map (docs/codegen.md): per frame an ID/length/extended macro set, a struct
 * of physical values, decode/encode functions, raw pack/unpack helpers per signal and, on J1939 frames, a
 * PGN match. Decoding and encoding follow codec.ts exactly (physical = raw × scale + offset; encoding rounds
 * to the nearest raw, halves up, and clamps), so generated firmware agrees with the app bit for bit.
 * Pure text generation: the output depends only on the map and the options (no dates), so builds repeat.
 */
import { fieldFits, fieldLayout, type FieldLayout } from '../bits';
import { multiplexerIndex, rawBounds } from '../codec';
import { j1939Pgn } from '../j1939';
import type { CanMap, Frame, Signal, ValueType } from '../map';
import { commentText, doubleLiteral, intLiteral, intType, type IntType } from './c-text';
import { packStatements, signExtendExpression, unpackExpression } from './field-code';
import { allocateNames, codegenPrefixSchema, preferredName, type CodegenNote } from './identifiers';

export type { CodegenNote } from './identifiers';

/** Version of the generated code's shape; goes up when the generated API or arithmetic changes. */
export const CODEGEN_VERSION = '1.0.0';

export interface CodegenOptions {
	/** Prefix of every identifier and of the file names (`fw` → fw.h, fw.c, fw_engine_core_t). */
	prefix: string;
	/** Name shown in the header comment. */
	mapName: string;
	/** Revision shown in the header comment, e.g. "r7"; omitted for a map read from a file. */
	revision?: string | null;
	/** Product and version of the generator, shown in the header comment. */
	generatorVersion: string;
}

/** What was generated for one signal, for callers that refer to it (tests, downloads). */
export interface GeneratedSignal {
	/** Index in the frame's `signals`. */
	index: number;
	name: string;
	/** Struct member (a C name). */
	member: string;
	/** Type `unpack` returns and `pack` takes (floats travel as their IEEE 754 bit pattern). */
	rawType: IntType;
	unpack: string;
	pack: string;
	/** Whether `encode` writes it (false when scale is 0: no raw value maps back). */
	encoded: boolean;
}

export interface GeneratedFrame {
	index: number;
	name: string;
	/** The frame's C name: identifiers are `<prefix>_<cName>_…`. */
	cName: string;
	typeName: string;
	decode: string;
	encode: string;
	/** `int …_matches(uint32_t id)` of a J1939 frame, else null. */
	matches: string | null;
	/** Struct member holding the multiplexer's raw value after decoding, with its type; null without multiplexer. */
	page: { member: string; type: IntType } | null;
	/** Signals in the generated code, in map order; signals that cannot be generated are left out (see notes). */
	signals: GeneratedSignal[];
}

export interface CodegenResult {
	header: string;
	source: string;
	notes: CodegenNote[];
	frames: GeneratedFrame[];
}

const PAGE_MEMBER = 'mux_page';
const FLOAT32_MAX = '3.4028234663852886e38'; // largest finite binary32 (IEEE 754), as codec.ts clamps
const FLOAT64_MAX = '1.7976931348623157e308'; // largest finite binary64 (IEEE 754)

interface SignalModel {
	index: number;
	signal: Signal;
	layout: FieldLayout;
	kind: ValueType;
	rawType: IntType;
	unsignedType: IntType;
	/** Page (multiplexer value) the signal belongs to, or null when always present. */
	muxValue: number | null;
	encoded: boolean;
	member: string;
	fn: string;
}

interface FrameModel {
	index: number;
	frame: Frame;
	name: string;
	fn: string;
	macro: string;
	signals: SignalModel[];
	mux: SignalModel | null;
	j1939: boolean;
}

const signalPath = (f: number, s: number) => `frames[${f}].signals[${s}]`;

/** Signals the generated code can carry, with a note for each one it must leave out. */
function usableSignals(frame: Frame, f: number, notes: CodegenNote[]) {
	const usable: { index: number; signal: Signal; layout: FieldLayout }[] = [];
	const note = (s: number, message: string) => notes.push({ path: signalPath(f, s), message });
	frame.signals.forEach((signal, s) => {
		const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
		const floatLength =
			signal.valueType === 'float32' ? 32 : signal.valueType === 'float64' ? 64 : null;
		if (floatLength !== null && signal.length !== floatLength) {
			note(
				s,
				`"${signal.name}" is ${signal.valueType} but ${signal.length} bits long; left out of the generated code`
			);
		} else if (layout.lowByte < 0) {
			note(
				s,
				`"${signal.name}" runs past byte 0 (big-endian bits continue in the byte before); left out of the generated code`
			);
		} else if (!fieldFits(layout, frame.length)) {
			note(
				s,
				`"${signal.name}" needs payload bytes ${layout.lowByte}…${layout.highByte} but the frame has ${frame.length}; left out of the generated code`
			);
		} else {
			usable.push({ index: s, signal, layout });
		}
	});
	// The multiplexer is the first signal marked as one, as codec.ts decides.
	const muxAt = multiplexerIndex(frame);
	const mux = usable.find((u) => u.index === muxAt) ?? null;
	return usable.filter(({ index, signal }) => {
		if (signal.muxValue === null || index === muxAt) return true;
		if (mux === null) {
			note(
				index,
				`"${signal.name}" has mux value ${signal.muxValue} but the frame has no usable multiplexer, so it is never decoded; left out`
			);
			return false;
		}
		if (mux.signal.valueType === 'unsigned' || mux.signal.valueType === 'signed') {
			const { lo, hi } = rawBounds(mux.signal);
			const value = BigInt(signal.muxValue);
			if (value < lo || value > hi) {
				note(
					index,
					`"${signal.name}" has mux value ${signal.muxValue}, which the multiplexer "${mux.signal.name}" can never carry; left out`
				);
				return false;
			}
		}
		return true;
	});
}

function rawTypes(signal: Signal): { rawType: IntType; unsignedType: IntType } {
	const unsignedType = intType(signal.length, false);
	return {
		rawType: signal.valueType === 'signed' ? intType(signal.length, true) : unsignedType,
		unsignedType
	};
}

/** Frames and signals with their C names, checked and disambiguated. */
function buildModel(map: CanMap, prefix: string, notes: CodegenNote[]): FrameModel[] {
	const P = prefix.toUpperCase();
	const taken = new Set<string>([
		`${P}_H`,
		`${prefix}_j1939_pgn`,
		`${prefix}_finite`,
		`${prefix}_round`,
		`${prefix}_f32_from_bits`,
		`${prefix}_f64_from_bits`,
		`${prefix}_float_is_32_bits`,
		`${prefix}_double_is_64_bits`
	]);
	const frameNames = allocateNames(
		map.frames.map((frame, f) => ({
			path: `frames[${f}]`,
			original: frame.name,
			...preferredName(frame.name, `frame_${f}`, false),
			identifiers: (n: string) => [
				...['t', 'decode', 'encode', 'matches'].map((s) => `${prefix}_${n}_${s}`),
				...['ID', 'EXTENDED', 'LENGTH', 'PGN'].map((s) => `${P}_${n.toUpperCase()}_${s}`)
			]
		})),
		taken,
		notes
	);

	const usable = map.frames.map((frame, f) => usableSignals(frame, f, notes));
	const muxAts = map.frames.map((frame) => multiplexerIndex(frame));
	const hasPage = usable.map((list, f) => list.some((u) => u.index === muxAts[f]));
	// A frame's struct members share one namespace, and `mux_page` is taken where a multiplexer exists.
	hasPage.forEach((yes, f) => {
		if (yes) taken.add(`member ${f} ${PAGE_MEMBER}`);
	});
	const claims = usable.flatMap((list, f) =>
		list.map(({ index, signal }) => ({
			path: signalPath(f, index),
			original: signal.name,
			...preferredName(signal.name, `signal_${index}`, true),
			identifiers: (n: string) => [
				`member ${f} ${n}`,
				...['unpack', 'pack', 'to_raw'].map((s) => `${prefix}_${frameNames[f]}_${n}_${s}`)
			]
		}))
	);
	const signalNames = allocateNames(claims, taken, notes);

	let k = 0;
	return map.frames.map((frame, f) => {
		const name = frameNames[f];
		const signals: SignalModel[] = usable[f].map(({ index, signal, layout }) => {
			const member = signalNames[k++];
			if (signal.scale === 0)
				notes.push({
					path: signalPath(f, index),
					message: `"${signal.name}" has scale 0: decode gives its offset, encode leaves its bits unchanged`
				});
			return {
				index,
				signal,
				layout,
				kind: signal.valueType,
				...rawTypes(signal),
				muxValue: signal.muxValue,
				encoded: signal.scale !== 0,
				member,
				fn: `${prefix}_${name}_${member}`
			};
		});
		const j1939 = frame.j1939 && frame.extended;
		if (frame.j1939 && !frame.extended)
			notes.push({
				path: `frames[${f}]`,
				message: `"${frame.name}" is marked J1939 but has an 11-bit ID; no PGN match helper is generated`
			});
		const mux = signals.find((s) => s.index === muxAts[f]) ?? null;
		// With a multiplexer, muxValue decides presence; without one, only signals without muxValue remain.
		return {
			index: f,
			frame,
			name,
			fn: `${prefix}_${name}`,
			macro: `${P}_${name.toUpperCase()}`,
			signals,
			mux,
			j1939
		};
	});
}

const hex = (n: number) => `0x${n.toString(16).toUpperCase()}`;

function describeFrame(frame: Frame): string {
	const parts = [
		`"${frame.name}"`,
		`ID ${hex(frame.id)} ${frame.extended ? 'extended' : 'standard'}`,
		`${frame.length} bytes`
	];
	if (frame.j1939 && frame.extended) parts.push(`J1939 PGN ${hex(j1939Pgn(frame.id))}`);
	if (frame.cycleMs !== null) parts.push(`every ${frame.cycleMs} ms`);
	if (frame.sender) parts.push(`from ${frame.sender}`);
	return commentText(parts.join(', '));
}

function describeSignal(s: SignalModel, isMux: boolean): string {
	const { signal } = s;
	const unit = signal.unit ? ` [${signal.unit}]` : '';
	const scaling = `scale ${signal.scale}, offset ${signal.offset}`;
	const value = s.kind === 'float32' || s.kind === 'float64' ? `${s.kind}, ${scaling}` : scaling;
	const page = s.muxValue !== null ? `, page ${s.muxValue} only` : '';
	const mux = isMux ? ', the multiplexer' : '';
	return commentText(
		`"${signal.name}"${unit}: start bit ${signal.startBit}, ${signal.length} bit${signal.length === 1 ? '' : 's'} ${signal.byteOrder}-endian, ${value}${mux}${page}`
	);
}

/** Condition under which signal `s` is present, given the page variable (the multiplexer's raw value). */
function pageCondition(
	s: SignalModel,
	mux: SignalModel,
	page: string,
	prefix: string
): string | null {
	if (s.muxValue === null) return null;
	// codec.ts compares the multiplexer's decoded raw (a float's value) with muxValue.
	if (mux.kind === 'float32')
		return `(double)${prefix}_f32_from_bits(${page}) == ${doubleLiteral(s.muxValue)}`;
	if (mux.kind === 'float64')
		return `${prefix}_f64_from_bits(${page}) == ${doubleLiteral(s.muxValue)}`;
	return `${page} == ${intLiteral(BigInt(s.muxValue), mux.rawType)}`;
}

function physicalExpression(s: SignalModel, raw: string, prefix: string): string {
	const value =
		s.kind === 'float32'
			? `(double)${prefix}_f32_from_bits(${raw})`
			: s.kind === 'float64'
				? `${prefix}_f64_from_bits(${raw})`
				: `(double)${raw}`;
	return `${value} * ${doubleLiteral(s.signal.scale)} + ${doubleLiteral(s.signal.offset)}`;
}

const indent = (lines: string[], depth = 1) => lines.map((l) => `${'\t'.repeat(depth)}${l}`);

function unpackFunction(s: SignalModel): string[] {
	const body =
		s.kind === 'signed'
			? [
					`${s.unsignedType} u = ${unpackExpression(s.layout, s.unsignedType)};`,
					`return ${signExtendExpression('u', s.signal.length, s.unsignedType, s.rawType)};`
				]
			: [`return ${unpackExpression(s.layout, s.unsignedType)};`];
	return [`${s.rawType} ${s.fn}_unpack(const uint8_t *data)`, '{', ...indent(body), '}'];
}

function packFunction(s: SignalModel): string[] {
	const body =
		s.kind === 'signed'
			? [
					`${s.unsignedType} u = (${s.unsignedType})raw;`,
					...packStatements(s.layout, 'u', s.unsignedType)
				]
			: packStatements(s.layout, 'raw', s.unsignedType);
	return [`void ${s.fn}_pack(uint8_t *data, ${s.rawType} raw)`, '{', ...indent(body), '}'];
}

/**
 * Physical value → raw value as codec.ts's encodeSignal computes it: (value − offset) / scale, then
 * for integers Math.round (halves towards +∞) and a clamp to the field's range; for floats a clamp to the
 * largest finite value of the format. Returns 1 when clamped, 0 when not, −1 for NaN or ±∞.
 */
function toRawFunction(s: SignalModel, prefix: string): string[] {
	const { signal } = s;
	const exact = `(value - ${doubleLiteral(signal.offset)}) / ${doubleLiteral(signal.scale)}`;
	const head = [
		`static int ${s.fn}_to_raw(double value, ${s.rawType} *raw)`,
		'{',
		'\tdouble x;',
		...(s.kind === 'float32' ? ['\tfloat f;'] : s.kind === 'float64' ? ['\tint clamped = 0;'] : []),
		`\tif (!${prefix}_finite(value))`,
		'\t\treturn -1;'
	];
	if (s.kind === 'float32')
		return [
			...head,
			`\tx = ${exact};`,
			`\tf = (float)(x > ${FLOAT32_MAX} ? ${FLOAT32_MAX} : x < -${FLOAT32_MAX} ? -${FLOAT32_MAX} : x);`,
			'\tmemcpy(raw, &f, sizeof f);',
			`\treturn x > ${FLOAT32_MAX} || x < -${FLOAT32_MAX};`,
			'}'
		];
	if (s.kind === 'float64')
		return [
			...head,
			`\tx = ${exact};`,
			`\tif (!${prefix}_finite(x)) {`,
			`\t\tx = x > 0.0 ? ${FLOAT64_MAX} : -${FLOAT64_MAX};`,
			'\t\tclamped = 1;',
			'\t}',
			'\tmemcpy(raw, &x, sizeof x);',
			'\treturn clamped;',
			'}'
		];
	const { lo, hi } = rawBounds(signal);
	// Powers of two are exact doubles: x < lo and x ≥ hi + 1 are the exact range tests for a whole x.
	const loDouble = lo === 0n ? '0.0' : `-${2n ** BigInt(signal.length - 1)}.0`;
	const hiDouble = `${hi + 1n}.0`;
	return [
		...head,
		`\tx = ${prefix}_round(${exact});`,
		`\tif (x < ${loDouble}) {`,
		`\t\t*raw = ${intLiteral(lo, s.rawType)};`,
		'\t\treturn 1;',
		'\t}',
		`\tif (x >= ${hiDouble}) {`,
		`\t\t*raw = ${intLiteral(hi, s.rawType)};`,
		'\t\treturn 1;',
		'\t}',
		`\t*raw = (${s.rawType})x;`,
		'\treturn 0;',
		'}'
	];
}

function decodeFunction(m: FrameModel, prefix: string): string[] {
	const lines: string[] = [];
	if (m.frame.length > 0) lines.push(`if (length < ${m.macro}_LENGTH)`, '\treturn -1;');
	else lines.push('(void)length;');
	if (m.signals.length === 0) lines.push('(void)data;', '(void)out;');
	if (m.mux) lines.push(`out->${PAGE_MEMBER} = ${m.mux.fn}_unpack(data);`);
	for (const s of m.signals) {
		const raw = s === m.mux ? `out->${PAGE_MEMBER}` : `${s.fn}_unpack(data)`;
		const assign = `out->${s.member} = ${physicalExpression(s, raw, prefix)};`;
		const condition = m.mux && pageCondition(s, m.mux, `out->${PAGE_MEMBER}`, prefix);
		lines.push(...(condition ? [`if (${condition})`, `\t${assign}`] : [assign]));
	}
	lines.push('return 0;');
	return [
		`int ${m.fn}_decode(const uint8_t *data, uint8_t length, ${m.fn}_t *out)`,
		'{',
		...indent(lines),
		'}'
	];
}

function encodeFunction(m: FrameModel, prefix: string): string[] {
	const encoded = m.signals.filter((s) => s.encoded);
	const local = (s: SignalModel) => `r${s.index}`;
	// Without an encodable multiplexer the page is unknown, so no page signal is written.
	const muxLocal = m.mux?.encoded ? local(m.mux) : null;
	const condition = (s: SignalModel) => {
		if (s.muxValue === null) return null;
		return m.mux && muxLocal ? pageCondition(s, m.mux, muxLocal, prefix) : '0';
	};
	const written = encoded.filter((s) => condition(s) !== '0');
	const lines: string[] = [
		...written.map((s) => `${s.rawType} ${local(s)} = 0;`),
		'int clamped = 0;',
		...(written.length ? ['int status;'] : [])
	];
	if (m.frame.length > 0) lines.push(`if (length < ${m.macro}_LENGTH)`, '\treturn -1;');
	else lines.push('(void)length;');
	if (written.length === 0) lines.push('(void)in;', '(void)data;');
	// First every raw value (so a NaN leaves the payload untouched), then the writes. The multiplexer
	// goes first: its raw value decides which page's signals are written.
	const order = m.mux && muxLocal ? [m.mux, ...written.filter((s) => s !== m.mux)] : written;
	for (const s of order) {
		const convert = [
			`status = ${s.fn}_to_raw(in->${s.member}, &${local(s)});`,
			'if (status < 0)',
			'\treturn -2;',
			'clamped += status;'
		];
		const c = s === m.mux ? null : condition(s);
		lines.push(...(c ? [`if (${c}) {`, ...indent(convert), '}'] : convert));
	}
	for (const s of written) {
		const pack = `${s.fn}_pack(data, ${local(s)});`;
		const c = condition(s);
		lines.push(...(c ? [`if (${c})`, `\t${pack}`] : [pack]));
	}
	lines.push('return clamped;');
	return [
		`int ${m.fn}_encode(const ${m.fn}_t *in, uint8_t *data, uint8_t length)`,
		'{',
		...indent(lines),
		'}'
	];
}

function headerComment(file: string, options: CodegenOptions): string[] {
	return [
		'/*',
		` * ${file}: C99 code for packing and unpacking the frames of a CAN map.`,
		` * Map:       ${commentText(options.mapName)}`,
		` * Revision:  ${options.revision ? commentText(options.revision) : 'none (generated from a map file)'}`,
		` * Generator: ${commentText(options.generatorVersion)}`,
		' *',
		' * Generated code: change the map and generate again rather than editing this file.',
		' */'
	];
}

const API_COMMENT = [
	'/*',
	' * Per frame F (see docs/codegen.md of Framewright):',
	' *   <PREFIX>_F_ID, _EXTENDED (1 for a 29-bit ID), _LENGTH (payload bytes), and _PGN on J1939 frames.',
	' *   <prefix>_F_t: one double per signal, the physical value (raw x scale + offset).',
	' *   <prefix>_F_decode(data, length, out): 0, or -1 when length is shorter than the frame.',
	' *     On a multiplexed frame out->mux_page is the multiplexer raw value, and only the signals of that',
	' *     page are written; the other page signals keep whatever value they had.',
	' *   <prefix>_F_encode(in, data, length): writes the signals into data and leaves every other bit',
	' *     as it was (fill the payload first, e.g. with 0x00 or 0xFF). Each value is rounded to the',
	' *     nearest raw value (halves up) and clamped to the field. Returns how many values were clamped,',
	' *     -1 when length is shorter than the frame, -2 (nothing written) when a value is NaN or infinite.',
	' *     A multiplexed frame writes the page signals of the page its multiplexer value selects.',
	' *   <prefix>_F_S_unpack(data) / <prefix>_F_S_pack(data, raw): the raw bits of signal S, integer',
	' *     operations only; floats travel as their IEEE 754 bit pattern; pack drops bits above the field.',
	' *   <prefix>_F_matches(id) on J1939 frames: 1 when a received 29-bit ID carries the frame PGN.',
	' * Bit numbering: start bit = least significant bit; payload bit b is bit b % 8 of byte b / 8;',
	' * big-endian fields climb to bit 7 of a byte, then continue at bit 0 of the byte before.',
	' */'
];

export function generateC(map: CanMap, options: CodegenOptions): CodegenResult {
	const checked = codegenPrefixSchema.safeParse(options.prefix);
	if (!checked.success) throw new RangeError(checked.error.issues[0].message);
	const prefix = options.prefix;
	const P = prefix.toUpperCase();
	const notes: CodegenNote[] = [];
	const model = buildModel(map, prefix, notes);
	// Notes in map order (frame, then its signals), whichever step found them.
	const position = (path: string) => [...path.matchAll(/\d+/g)].map(Number);
	notes.sort((a, b) => {
		const [pa, pb] = [position(a.path), position(b.path)];
		return (pa[0] ?? -1) - (pb[0] ?? -1) || (pa[1] ?? -1) - (pb[1] ?? -1);
	});
	const all = model.flatMap((m) => m.signals);
	const uses = {
		j1939: model.some((m) => m.j1939),
		float32: all.some((s) => s.kind === 'float32'),
		float64: all.some((s) => s.kind === 'float64'),
		integerEncode: all.some((s) => s.encoded && (s.kind === 'unsigned' || s.kind === 'signed')),
		encode: all.some((s) => s.encoded)
	};

	const header: string[] = [
		...headerComment(`${prefix}.h`, options),
		`#ifndef ${P}_H`,
		`#define ${P}_H`,
		'',
		'#include <stdint.h>',
		'',
		'#ifdef __cplusplus',
		'extern "C" {',
		'#endif',
		'',
		...API_COMMENT
	];
	if (uses.j1939)
		header.push(
			'',
			'/* PGN of a 29-bit J1939 ID (SAE J1939-21): data page bits and PF, plus PS when PF >= 240',
			' * (PDU2); for PDU1 (PF < 240) PS is a destination address and not part of the PGN.',
			' * Bits 29-31, where some drivers keep flags, are ignored. */',
			`uint32_t ${prefix}_j1939_pgn(uint32_t id);`
		);
	for (const m of model) {
		header.push('', `/* Frame ${describeFrame(m.frame)} */`);
		header.push(
			`#define ${m.macro}_ID ${hex(m.frame.id)}u`,
			`#define ${m.macro}_EXTENDED ${m.frame.extended ? 1 : 0}`,
			`#define ${m.macro}_LENGTH ${m.frame.length}`
		);
		if (m.j1939) header.push(`#define ${m.macro}_PGN ${hex(j1939Pgn(m.frame.id))}u`);
		const members: string[] = [];
		if (m.mux)
			members.push(
				`${m.mux.rawType} ${PAGE_MEMBER}; /* multiplexer raw value: the page decode filled */`
			);
		for (const s of m.signals)
			members.push(`double ${s.member}; /* ${describeSignal(s, s === m.mux)} */`);
		if (members.length === 0) members.push('char no_signals; /* C99 allows no empty struct */');
		header.push('typedef struct {', ...indent(members), `} ${m.fn}_t;`);
		header.push(
			`int ${m.fn}_decode(const uint8_t *data, uint8_t length, ${m.fn}_t *out);`,
			`int ${m.fn}_encode(const ${m.fn}_t *in, uint8_t *data, uint8_t length);`
		);
		if (m.j1939) header.push(`int ${m.fn}_matches(uint32_t id);`);
		for (const s of m.signals)
			header.push(
				`${s.rawType} ${s.fn}_unpack(const uint8_t *data);`,
				`void ${s.fn}_pack(uint8_t *data, ${s.rawType} raw);`
			);
	}
	header.push('', '#ifdef __cplusplus', '}', '#endif', '', `#endif /* ${P}_H */`);

	const source: string[] = [...headerComment(`${prefix}.c`, options), `#include "${prefix}.h"`];
	if (uses.float32 || uses.float64) source.push('', '#include <string.h>');
	if (uses.float32)
		source.push(
			'',
			'/* float travels as a 32-bit IEEE 754 pattern: refuse to compile where it is not 4 bytes. */',
			`typedef char ${prefix}_float_is_32_bits[sizeof(float) == 4 ? 1 : -1];`
		);
	if (uses.float64)
		source.push(
			'',
			'/* double travels as a 64-bit IEEE 754 pattern: refuse to compile where it is not 8 bytes. */',
			`typedef char ${prefix}_double_is_64_bits[sizeof(double) == 8 ? 1 : -1];`
		);
	if (uses.encode)
		source.push(
			'',
			'/* Neither NaN nor infinite (without <math.h>). */',
			`static int ${prefix}_finite(double x)`,
			'{',
			`\treturn x >= -${FLOAT64_MAX} && x <= ${FLOAT64_MAX};`,
			'}'
		);
	if (uses.integerEncode)
		source.push(
			'',
			'/* Nearest whole number, halves towards +infinity (as JavaScript Math.round, so generated code',
			' * encodes exactly as Framewright does). From 2^52 on every double is already whole. */',
			`static double ${prefix}_round(double x)`,
			'{',
			'\tint64_t t;',
			'\tdouble fraction;',
			'\tif (!(x > -4503599627370496.0 && x < 4503599627370496.0))',
			'\t\treturn x;',
			'\tt = (int64_t)x; /* towards zero */',
			'\tfraction = x - (double)t; /* exact */',
			'\tif (fraction >= 0.5)',
			'\t\tt += 1;',
			'\telse if (fraction < -0.5)',
			'\t\tt -= 1;',
			'\treturn (double)t;',
			'}'
		);
	if (uses.float32)
		source.push(
			'',
			`static float ${prefix}_f32_from_bits(uint32_t bits)`,
			'{',
			'\tfloat f;',
			'\tmemcpy(&f, &bits, sizeof f);',
			'\treturn f;',
			'}'
		);
	if (uses.float64)
		source.push(
			'',
			`static double ${prefix}_f64_from_bits(uint64_t bits)`,
			'{',
			'\tdouble d;',
			'\tmemcpy(&d, &bits, sizeof d);',
			'\treturn d;',
			'}'
		);
	if (uses.j1939)
		source.push(
			'',
			`uint32_t ${prefix}_j1939_pgn(uint32_t id)`,
			'{',
			'\tuint32_t pgn = (id >> 8) & 0x3FFFFu;',
			'\tif (((pgn >> 8) & 0xFFu) < 240u)',
			'\t\tpgn &= 0x3FF00u;',
			'\treturn pgn;',
			'}'
		);
	for (const m of model) {
		source.push('', `/* Frame ${describeFrame(m.frame)} */`);
		for (const s of m.signals) {
			source.push('', ...unpackFunction(s), '', ...packFunction(s));
			if (s.encoded) source.push('', ...toRawFunction(s, prefix));
		}
		source.push('', ...decodeFunction(m, prefix), '', ...encodeFunction(m, prefix));
		if (m.j1939)
			source.push(
				'',
				`int ${m.fn}_matches(uint32_t id)`,
				'{',
				`\treturn ${prefix}_j1939_pgn(id) == ${m.macro}_PGN;`,
				'}'
			);
	}

	return {
		header: `${header.join('\n')}\n`,
		source: `${source.join('\n')}\n`,
		notes,
		frames: model.map((m) => ({
			index: m.index,
			name: m.frame.name,
			cName: m.name,
			typeName: `${m.fn}_t`,
			decode: `${m.fn}_decode`,
			encode: `${m.fn}_encode`,
			matches: m.j1939 ? `${m.fn}_matches` : null,
			page: m.mux ? { member: PAGE_MEMBER, type: m.mux.rawType } : null,
			signals: m.signals.map((s) => ({
				index: s.index,
				name: s.signal.name,
				member: s.member,
				rawType: s.rawType,
				unpack: `${s.fn}_unpack`,
				pack: `${s.fn}_pack`,
				encoded: s.encoded
			}))
		}))
	};
}
