/**
 * The compiled decoder: turns a map into per-signal extraction plans once, so decoding a capture
 * of millions of frames is a table lookup plus a few typed reads per signal. Byte-aligned 8/16/32/64-bit
 * and float fields read through DataView; other fields use number arithmetic (never BigInt).
 */
import { fieldLayout, readFloatNumber, readIntegerNumber, type FieldLayout } from './bits';
import { multiplexerIndex } from './codec';
import { j1939Pgn, j1939ValueStatus } from './j1939';
import {
	MAX_EXTENDED_ID,
	MAX_STANDARD_ID,
	type CanMap,
	type Frame,
	type Signal,
	type SignalRole
} from './map';
import { precisionOf, type ValuePrecision } from '../value-format';

export interface ChannelInfo {
	index: number;
	frameIndex: number;
	frameName: string;
	signalName: string;
	unit: string;
	min: number | null;
	max: number | null;
	/** How many decimals the signal's scale and offset allow when its values are printed. */
	precision?: ValuePrecision;
	/** What the signal carries (docs/map-format.md, "Signal roles"); absent on derived channels: a value. */
	role?: SignalRole;
}

/** Per-signal outcome written to the optional status array. */
export const SIGNAL_STATUS = { valid: 0, absent: 1, notAvailable: 2, error: 3 } as const;
export type SignalStatus = (typeof SIGNAL_STATUS)[keyof typeof SIGNAL_STATUS];

export interface CompiledFrame {
	frameIndex: number;
	frame: Frame;
	/** Index of this frame's first signal among all channels of the map. */
	channelStart: number;
	channelCount: number;
	/**
	 * Physical value of signal k → out[outOffset + k·stride]; NaN when absent (other mux page, bits
	 * past the received `length`) or, on J1939 frames, when an unsigned raw value is "not available"/
	 * "error" (SAE J1939-71). status[outOffset + k·stride] gets the matching SIGNAL_STATUS code.
	 * `stride` (default 1) lets a caller decode straight into column-major tables.
	 */
	decode(
		data: Uint8Array,
		offset: number,
		length: number,
		out: Float64Array,
		outOffset: number,
		status?: Uint8Array,
		stride?: number
	): void;
}

export interface CompiledMap {
	map: CanMap;
	channels: ChannelInfo[];
	frames: CompiledFrame[];
	/** The frame defined for a received ID: exact (id, extended) first, then J1939 frames by PGN. */
	lookup(id: number, extended: boolean): CompiledFrame | undefined;
	/** Same as `lookup`, as an index into `frames` (-1 when the map does not define the ID); no allocation. */
	indexOf(id: number, extended: boolean): number;
	/**
	 * `frames[frameIndex].decode(…)` through one dispatcher whose call to each frame's decoder is its own
	 * call site, so a loop over many frame kinds avoids one megamorphic call site (the hot path of a capture).
	 */
	decodeAt(
		frameIndex: number,
		data: Uint8Array,
		offset: number,
		length: number,
		out: Float64Array,
		outOffset: number,
		status?: Uint8Array,
		stride?: number
	): void;
}

/** Reads a signal's raw value from the frame starting at data[base]. */
type RawReader = (data: Uint8Array, view: DataView, base: number) => number;

interface SignalPlan {
	layout: FieldLayout;
	valueType: Signal['valueType'];
	scale: number;
	offset: number;
	/** Bytes that must have been received for the field to be present; Infinity if it can never fit. */
	needBytes: number;
	/** Mux page the signal belongs to, or null when always present. */
	muxValue: number | null;
	/** Apply the J1939-71 not-available/error ranges (unsigned signal of a J1939 frame). */
	j1939: boolean;
}

function planSignal(signal: Signal, frame: Frame): SignalPlan {
	const floatLength =
		signal.valueType === 'float32' ? 32 : signal.valueType === 'float64' ? 64 : null;
	const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
	// A float of the wrong length (a lint error) or a big-endian field running off byte 0 never decodes.
	const decodable = layout.lowByte >= 0 && (floatLength === null || floatLength === signal.length);
	return {
		layout,
		valueType: signal.valueType,
		scale: signal.scale,
		offset: signal.offset,
		needBytes: decodable ? layout.highByte + 1 : Number.POSITIVE_INFINITY,
		muxValue: signal.muxValue,
		j1939: frame.j1939 && signal.valueType === 'unsigned'
	};
}

/** Portable reader: the shared number arithmetic of bits.ts (used when code generation is unavailable). */
function genericReader(plan: SignalPlan): RawReader {
	const { layout } = plan;
	if (plan.valueType === 'float32' || plan.valueType === 'float64')
		return (d, _v, b) => readFloatNumber(d, b, layout);
	const signed = plan.valueType === 'signed';
	return (d, _v, b) => readIntegerNumber(d, b, layout, signed);
}

/**
 * JavaScript expression reading the raw value from `d` (bytes), `v` (DataView) at frame start `b`.
 * Whole-byte 8/16/32/64-bit and float fields use DataView; other fields up to 32 bits combine at most
 * five bytes with 32-bit integer operations; longer unaligned fields call a shared helper with the
 * field's layout, found in generated code as `layoutRef`.
 */
function readerSource(plan: SignalPlan, layoutRef: string): string {
	const { lsbByte, shift, length, step, lowByte, byteCount } = plan.layout;
	const le = step === 1;
	const at = `b + ${lowByte}`;
	const float = plan.valueType === 'float32' || plan.valueType === 'float64';
	const signed = plan.valueType === 'signed';
	if (shift === 0 && length % 8 === 0) {
		switch (`${float ? 'f' : signed ? 'i' : 'u'}${length}`) {
			case 'u8':
				return `d[${at}]`;
			case 'i8':
				return `v.getInt8(${at})`;
			case 'u16':
				return `v.getUint16(${at}, ${le})`;
			case 'i16':
				return `v.getInt16(${at}, ${le})`;
			case 'u32':
				return `v.getUint32(${at}, ${le})`;
			case 'i32':
				return `v.getInt32(${at}, ${le})`;
			case 'f32':
				return `v.getFloat32(${at}, ${le})`;
			case 'f64':
				return `v.getFloat64(${at}, ${le})`;
			// 64-bit integers as two halves: high × 2^32 is exact, so the sum rounds once (like Number(BigInt)).
			case 'u64':
			case 'i64': {
				const [hi, lo] = le ? [`${at} + 4`, at] : [at, `${at} + 4`];
				return `(v.get${signed ? 'Int' : 'Uint'}32(${hi}, ${le}) * 4294967296 + v.getUint32(${lo}, ${le}))`;
			}
		}
	}
	if (float) return `F(d, b, ${layoutRef})`;
	if (length > 32) return `I(d, b, ${layoutRef}, ${signed})`;
	const byteAt = (j: number) => `d[b + ${lsbByte + step * j}]`;
	const word = Array.from({ length: Math.min(byteCount, 4) }, (_, j) =>
		j === 0 ? byteAt(0) : `(${byteAt(j)} << ${8 * j})`
	).join(' | ');
	let unsigned: string;
	if (byteCount <= 4) {
		unsigned =
			length === 32 ? `((${word}) >>> 0)` : `(((${word}) >>> ${shift}) & ${2 ** length - 1})`;
	} else {
		// fifth byte: its low (shift + length − 32) bits sit above the 32 − shift bits of the word
		const highBits = shift + length - 32;
		unsigned = `(((${word}) >>> ${shift}) + (${byteAt(4)} & ${2 ** highBits - 1}) * ${2 ** (32 - shift)})`;
	}
	// Sign extension by shifting the sign bit to bit 31 and back (arithmetic shift).
	return signed ? `((${unsigned} << ${32 - length}) >> ${32 - length})` : unsigned;
}

const J1939_STATUS_CODE = {
	valid: SIGNAL_STATUS.valid,
	reserved: SIGNAL_STATUS.valid, // reserved ranges still carry a value; alert rules judge it
	notAvailable: SIGNAL_STATUS.notAvailable,
	error: SIGNAL_STATUS.error
} as const;

type DecodeFn = CompiledFrame['decode'];

/** Numbers embedded in generated code print exactly (JS number → string round-trips). */
const num = (n: number) => `(${Object.is(n, -0) ? '-0' : String(n)})`;

/** What code generation needs to know of one frame. */
interface FramePlan {
	plans: SignalPlan[];
	muxPlan: SignalPlan | null;
	muxAt: number;
}

/**
 * Straight-line statements decoding one frame from `d` at `b` (received length `len`, DataView `v`)
 * into out[o + k·s] and st[o + k·s]. `layouts` is the expression naming this frame's layout array.
 * The generated text contains only numbers computed here, never strings from the map.
 */
function decodeStatements({ plans, muxPlan, muxAt }: FramePlan, layouts: string): string[] {
	const lines: string[] = [];
	const muxRead =
		muxPlan && Number.isFinite(muxPlan.needBytes)
			? readerSource(muxPlan, `${layouts}[${muxAt}]`)
			: null;
	lines.push(`const sel = ${muxRead ? `len >= ${muxPlan!.needBytes} ? ${muxRead} : NaN` : 'NaN'};`);
	plans.forEach((plan, k) => {
		const at = k === 0 ? 'o' : `o + ${k} * s`;
		const conditions: string[] = [];
		if (!Number.isFinite(plan.needBytes)) conditions.push('false');
		else if (plan.needBytes > 0) conditions.push(`len >= ${plan.needBytes}`);
		if (plan.muxValue !== null) conditions.push(`sel === ${plan.muxValue}`);
		const present = conditions.length ? conditions.join(' && ') : 'true';
		const scaled = `r * ${num(plan.scale)} + ${num(plan.offset)}`;
		const read = readerSource(plan, `${layouts}[${k}]`);
		const valid = plan.j1939
			? `{ const r = ${read}; const c = J[S(r, ${plan.layout.length})]; out[${at}] = c === 0 ? ${scaled} : NaN; if (st) st[${at}] = c; }`
			: `{ const r = ${Number.isFinite(plan.needBytes) ? read : 'NaN'}; out[${at}] = ${scaled}; if (st) st[${at}] = 0; }`;
		lines.push(`if (${present}) ${valid} else { out[${at}] = NaN; if (st) st[${at}] = 1; }`);
	});
	return lines;
}

/** Helpers the generated code calls, in the order of the generated factories' parameters. */
const GENERATED_HELPERS = ['viewOf', 'L', 'F', 'I', 'S', 'J'] as const;
const helperValues = (viewOf: (d: Uint8Array) => DataView, layouts: unknown) =>
	[
		viewOf,
		layouts,
		readFloatNumber,
		readIntegerNumber,
		j1939ValueStatus,
		J1939_STATUS_CODE
	] as const;

/**
 * One straight-line decode function per frame, so the engine can inline every read.
 * Returns null where code generation is forbidden (e.g. a Content-Security-Policy without 'unsafe-eval').
 */
function generateDecode(
	framePlan: FramePlan,
	viewOf: (d: Uint8Array) => DataView
): DecodeFn | null {
	const body = ['const v = viewOf(d);', ...decodeStatements(framePlan, 'L')].join('\n');
	try {
		const factory = new Function(
			...GENERATED_HELPERS,
			`return function decode(d, b, len, out, o, st, s = 1) {\n${body}\n};`
		);
		return factory(
			...helperValues(
				viewOf,
				framePlan.plans.map((p) => p.layout)
			)
		) as DecodeFn;
	} catch {
		return null;
	}
}

/** The same decode as a loop over portable closures; slower, but needs no code generation. */
function loopDecode(
	plans: SignalPlan[],
	muxPlan: SignalPlan | null,
	viewOf: (d: Uint8Array) => DataView
): DecodeFn {
	const readers = plans.map(genericReader);
	const muxReader = muxPlan ? readers[plans.indexOf(muxPlan)] : null;
	const count = plans.length;
	return (data, offset, length, out, outOffset, status, stride = 1) => {
		const view = viewOf(data);
		// NaN never equals a muxValue: a missing multiplexer hides every multiplexed signal.
		const selected =
			muxPlan && muxReader && muxPlan.needBytes <= length
				? muxReader(data, view, offset)
				: Number.NaN;
		for (let k = 0; k < count; k++) {
			const plan = plans[k];
			const at = outOffset + k * stride;
			if (plan.needBytes > length || (plan.muxValue !== null && plan.muxValue !== selected)) {
				out[at] = Number.NaN;
				if (status) status[at] = SIGNAL_STATUS.absent;
				continue;
			}
			const raw = readers[k](data, view, offset);
			const code: SignalStatus = plan.j1939
				? J1939_STATUS_CODE[j1939ValueStatus(raw, plan.layout.length)]
				: SIGNAL_STATUS.valid;
			out[at] = code === SIGNAL_STATUS.valid ? raw * plan.scale + plan.offset : Number.NaN;
			if (status) status[at] = code;
		}
	};
}

export interface CompileOptions {
	/** Generate specialised decode functions (default true); false forces the portable loop. */
	codegen?: boolean;
}

function planFrame(frame: Frame): FramePlan {
	const plans = frame.signals.map((s) => planSignal(s, frame));
	const muxAt = multiplexerIndex(frame);
	return { plans, muxPlan: muxAt >= 0 ? plans[muxAt] : null, muxAt };
}

function compileFrame(
	frame: Frame,
	framePlan: FramePlan,
	frameIndex: number,
	channelStart: number,
	viewOf: (d: Uint8Array) => DataView,
	codegen: boolean
): CompiledFrame {
	const { plans, muxPlan } = framePlan;
	const decode =
		(codegen && generateDecode(framePlan, viewOf)) || loopDecode(plans, muxPlan, viewOf);
	return { frameIndex, frame, channelStart, channelCount: plans.length, decode };
}

type DispatchFn = CompiledMap['decodeAt'];

/**
 * Signals whose decoding is written straight into the dispatcher's switch; frames beyond this budget
 * get a direct call instead, so the dispatcher stays small enough for the engine to optimise
 * (V8 declines to optimise very large functions).
 */
const INLINE_SIGNAL_BUDGET = 400;

/**
 * One function for the whole map: a switch whose cases hold each frame's decode statements, so
 * decoding a stream of mixed frames costs no call per frame and one DataView lookup per call —
 * where `frames[i].decode(…)` in a loop over many frame kinds is one megamorphic call site.
 * Frames with identical layouts (repeated per-wheel or per-cell frames are common) share one case,
 * chosen through a frame → case table: less code, and fewer mispredicted branches on mixed traffic.
 * Null where code generation is forbidden.
 */
function generateDispatch(
	framePlans: FramePlan[],
	frames: CompiledFrame[],
	viewOf: (d: Uint8Array) => DataView
): DispatchFn | null {
	const caseOf = new Int32Array(framePlans.length);
	const cases: string[] = [];
	const layouts: FieldLayout[][] = [];
	const caseByKey = new Map<string, number>();
	let budget = INLINE_SIGNAL_BUDGET;
	framePlans.forEach((framePlan, f) => {
		const frameLayouts = framePlan.plans.map((p) => p.layout);
		const statements = decodeStatements(framePlan, `L[${layouts.length}]`).join('\n');
		// Same statements over the same layouts decode alike (the statements name their layout only by index).
		const key = decodeStatements(framePlan, 'L[#]').join('\n') + JSON.stringify(frameLayouts);
		const shared = caseByKey.get(key);
		if (shared !== undefined) {
			caseOf[f] = shared;
			return;
		}
		caseOf[f] = cases.length;
		budget -= framePlan.plans.length;
		if (budget < 0) {
			cases.push(`case ${cases.length}: D[${f}](d, b, len, out, o, st, s); return;`);
			return;
		}
		caseByKey.set(key, cases.length);
		cases.push(`case ${cases.length}: {\n${statements}\nreturn;\n}`);
		layouts.push(frameLayouts);
	});
	const body = `const v = viewOf(d);\nswitch (C[f]) {\n${cases.join('\n')}\n}`;
	try {
		const factory = new Function(
			'D',
			'C',
			...GENERATED_HELPERS,
			`return function decodeAt(f, d, b, len, out, o, st, s = 1) {\n${body}\n};`
		);
		return factory(
			frames.map((fr) => fr.decode),
			caseOf,
			...helperValues(viewOf, layouts)
		) as DispatchFn;
	} catch {
		return null;
	}
}

function loopDispatch(frames: CompiledFrame[]): DispatchFn {
	return (frameIndex, data, offset, length, out, outOffset, status, stride) => {
		frames[frameIndex]?.decode(data, offset, length, out, outOffset, status, stride);
	};
}

/** Lookup key that keeps standard and extended IDs apart (IDs are below 2^29). */
const idKey = (id: number, extended: boolean) => (extended ? id + 0x20000000 : id);

export function compileMap(map: CanMap, options: CompileOptions = {}): CompiledMap {
	const codegen = options.codegen ?? true;
	// One DataView per backing buffer, reused while consecutive calls pass the same array.
	let lastData: Uint8Array | null = null;
	let lastView: DataView | null = null;
	const viewOf = (data: Uint8Array): DataView => {
		if (data !== lastData || lastView === null) {
			lastData = data;
			lastView = new DataView(data.buffer, data.byteOffset, data.byteLength);
		}
		return lastView;
	};

	const channels: ChannelInfo[] = [];
	const frames: CompiledFrame[] = [];
	const byId = new Map<number, number>();
	const byPgn = new Map<number, number>();
	// Standard IDs index a dense table: one typed read instead of a hash lookup per received frame.
	const standard = new Int32Array(MAX_STANDARD_ID + 1).fill(-1);
	const framePlans = map.frames.map(planFrame);
	map.frames.forEach((frame, frameIndex) => {
		const compiled = compileFrame(
			frame,
			framePlans[frameIndex],
			frameIndex,
			channels.length,
			viewOf,
			codegen
		);
		frames.push(compiled);
		for (const s of frame.signals) {
			channels.push({
				index: channels.length,
				frameIndex,
				frameName: frame.name,
				signalName: s.name,
				unit: s.unit,
				min: s.min,
				max: s.max,
				precision: precisionOf(s),
				role: s.role
			});
		}
		// First definition wins on duplicates; lintMap reports them.
		const key = idKey(frame.id, frame.extended);
		if (!byId.has(key)) {
			byId.set(key, frameIndex);
			if (!frame.extended && frame.id <= MAX_STANDARD_ID) standard[frame.id] = frameIndex;
		}
		if (frame.j1939 && frame.extended) {
			const pgn = j1939Pgn(frame.id);
			if (!byPgn.has(pgn)) byPgn.set(pgn, frameIndex);
		}
	});

	// Received extended IDs resolved by PGN, remembered so each distinct ID is parsed once.
	const pgnCache = new Map<number, number>();
	// Captures repeat IDs in runs (multi-packet transfers, bursts): remember the last extended answer.
	let lastExtendedId = -1;
	let lastExtendedIndex = -1;
	function extendedIndexOf(id: number): number {
		const exact = byId.get(idKey(id, true));
		if (exact !== undefined || byPgn.size === 0 || !(id >= 0 && id <= MAX_EXTENDED_ID))
			return exact ?? -1;
		let found = pgnCache.get(id);
		if (found === undefined) {
			found = byPgn.get(j1939Pgn(id)) ?? -1;
			pgnCache.set(id, found);
		}
		return found;
	}
	function indexOf(id: number, extended: boolean): number {
		if (!extended) {
			if (id >= 0 && id <= MAX_STANDARD_ID) {
				const slot = standard[id];
				if (slot !== undefined) return slot; // undefined only for a fractional id
			}
			return byId.get(idKey(id, false)) ?? -1;
		}
		if (id !== lastExtendedId) {
			lastExtendedIndex = extendedIndexOf(id);
			lastExtendedId = id;
		}
		return lastExtendedIndex;
	}
	const lookup = (id: number, extended: boolean): CompiledFrame | undefined =>
		frames[indexOf(id, extended)];
	const decodeAt =
		(codegen && generateDispatch(framePlans, frames, viewOf)) || loopDispatch(frames);

	return { map, channels, frames, lookup, indexOf, decodeAt };
}
