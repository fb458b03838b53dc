/**
 * The compiled decoder: turns a map into per-signal extraction plans once, so decoding a capture
 * of millions of frames is a table lookup plus a few typed reads per signal. Byte-aligned 8/16/32/64-bit
 * and float fields read through DataView; other fields use number arithmetic (never BigInt).
 */
import { fieldLayout, readFloatNumber, readIntegerNumber, readUnsigned32, type FieldLayout } from './bits';
import { multiplexerIndex } from './codec';
import { j1939Pgn, j1939ValueStatus } from './j1939';
import { MAX_EXTENDED_ID, type CanMap, type Frame, type Signal } from './map';

export interface ChannelInfo {
	index: number;
	frameIndex: number;
	frameName: string;
	signalName: string;
	unit: string;
	min: number | null;
	max: number | null;
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
	 * Physical value of signal k → out[outOffset + k]; NaN when absent (other mux page, bits past
	 * the received `length`) or, on J1939 frames, when an unsigned raw value is "not available"/"error"
	 * (SAE J1939-71). status[outOffset + k] gets the matching SIGNAL_STATUS code.
	 */
	decode(
		data: Uint8Array,
		offset: number,
		length: number,
		out: Float64Array,
		outOffset: number,
		status?: Uint8Array
	): void;
}

export interface CompiledMap {
	map: CanMap;
	channels: ChannelInfo[];
	frames: CompiledFrame[];
	/** The frame defined for a received ID: exact (id, extended) first, then J1939 frames by PGN. */
	lookup(id: number, extended: boolean): CompiledFrame | undefined;
}

/** Reads a signal's raw value from the frame starting at data[base]. */
type RawReader = (data: Uint8Array, view: DataView, base: number) => number;

interface SignalPlan {
	read: RawReader;
	scale: number;
	offset: number;
	/** Bytes that must have been received for the field to be present; Infinity if it can never fit. */
	needBytes: number;
	/** Mux page the signal belongs to, or null when always present. */
	muxValue: number | null;
	/** Apply the J1939-71 not-available/error ranges (unsigned signal of a J1939 frame). */
	j1939: boolean;
	length: number;
}

const TWO_POW_32 = 4294967296;

/** Fast DataView paths for whole-byte fields; null when the field is not byte-aligned or of an odd size. */
function alignedReader(signal: Signal, layout: FieldLayout): RawReader | null {
	if (layout.shift !== 0 || layout.length % 8 !== 0) return null;
	const at = layout.lowByte;
	const le = signal.byteOrder === 'little';
	const signed = signal.valueType === 'signed';
	switch (`${signal.valueType === 'float32' || signal.valueType === 'float64' ? 'f' : signed ? 'i' : 'u'}${layout.length}`) {
		case 'u8':
			return (d, _v, b) => d[b + at];
		case 'i8':
			return (_d, v, b) => v.getInt8(b + at);
		case 'u16':
			return (_d, v, b) => v.getUint16(b + at, le);
		case 'i16':
			return (_d, v, b) => v.getInt16(b + at, le);
		case 'u32':
			return (_d, v, b) => v.getUint32(b + at, le);
		case 'i32':
			return (_d, v, b) => v.getInt32(b + at, le);
		case 'f32':
			return (_d, v, b) => v.getFloat32(b + at, le);
		case 'f64':
			return (_d, v, b) => v.getFloat64(b + at, le);
		// 64-bit integers as two halves: the high half times 2^32 is exact, so the sum rounds once.
		case 'u64':
			return le
				? (_d, v, b) => v.getUint32(b + at + 4, true) * TWO_POW_32 + v.getUint32(b + at, true)
				: (_d, v, b) => v.getUint32(b + at, false) * TWO_POW_32 + v.getUint32(b + at + 4, false);
		case 'i64':
			return le
				? (_d, v, b) => v.getInt32(b + at + 4, true) * TWO_POW_32 + v.getUint32(b + at, true)
				: (_d, v, b) => v.getInt32(b + at, false) * TWO_POW_32 + v.getUint32(b + at + 4, false);
		default:
			return null;
	}
}

function genericReader(signal: Signal, layout: FieldLayout): RawReader {
	if (signal.valueType === 'float32' || signal.valueType === 'float64') {
		return (d, _v, b) => readFloatNumber(d, b, layout);
	}
	const signed = signal.valueType === 'signed';
	const { lsbByte, shift, length, step } = layout;
	if (length > 32) return (d, _v, b) => readIntegerNumber(d, b, layout, signed);
	const span = 2 ** length;
	const half = span / 2;
	if (shift + length <= 8) {
		const mask = span - 1;
		return signed
			? (d, _v, b) => {
					const u = (d[b + lsbByte] >> shift) & mask;
					return u >= half ? u - span : u;
				}
			: (d, _v, b) => (d[b + lsbByte] >> shift) & mask;
	}
	return signed
		? (d, _v, b) => {
				const u = readUnsigned32(d, b, lsbByte, shift, length, step);
				return u >= half ? u - span : u;
			}
		: (d, _v, b) => readUnsigned32(d, b, lsbByte, shift, length, step);
}

function planSignal(signal: Signal, frame: Frame): SignalPlan {
	const floatLength = signal.valueType === 'float32' ? 32 : signal.valueType === 'float64' ? 64 : null;
	const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
	// A float of the wrong length (a lint error) or a big-endian field running off byte 0 never decodes.
	const decodable = layout.lowByte >= 0 && (floatLength === null || floatLength === signal.length);
	return {
		read: decodable ? (alignedReader(signal, layout) ?? genericReader(signal, layout)) : () => Number.NaN,
		scale: signal.scale,
		offset: signal.offset,
		needBytes: decodable ? layout.highByte + 1 : Number.POSITIVE_INFINITY,
		muxValue: signal.muxValue,
		j1939: frame.j1939 && signal.valueType === 'unsigned',
		length: signal.length
	};
}

const J1939_STATUS_CODE = {
	valid: SIGNAL_STATUS.valid,
	reserved: SIGNAL_STATUS.valid, // reserved ranges still carry a value; alert rules judge it
	notAvailable: SIGNAL_STATUS.notAvailable,
	error: SIGNAL_STATUS.error
} as const;

function compileFrame(frame: Frame, frameIndex: number, channelStart: number, viewOf: (d: Uint8Array) => DataView): CompiledFrame {
	const plans = frame.signals.map((s) => planSignal(s, frame));
	const count = plans.length;
	const muxAt = multiplexerIndex(frame);
	const muxPlan = muxAt >= 0 ? plans[muxAt] : null;

	function decode(data: Uint8Array, offset: number, length: number, out: Float64Array, outOffset: number, status?: Uint8Array): void {
		const view = viewOf(data);
		// NaN never equals a muxValue: a missing multiplexer hides every multiplexed signal.
		const selected = muxPlan !== null && muxPlan.needBytes <= length ? muxPlan.read(data, view, offset) : Number.NaN;
		for (let k = 0; k < count; k++) {
			const plan = plans[k];
			if (plan.needBytes > length || (plan.muxValue !== null && plan.muxValue !== selected)) {
				out[outOffset + k] = Number.NaN;
				if (status) status[outOffset + k] = SIGNAL_STATUS.absent;
				continue;
			}
			const raw = plan.read(data, view, offset);
			let code: SignalStatus = SIGNAL_STATUS.valid;
			if (plan.j1939) code = J1939_STATUS_CODE[j1939ValueStatus(raw, plan.length)];
			out[outOffset + k] = code === SIGNAL_STATUS.valid ? raw * plan.scale + plan.offset : Number.NaN;
			if (status) status[outOffset + k] = code;
		}
	}

	return { frameIndex, frame, channelStart, channelCount: count, decode };
}

/** Lookup key that keeps standard and extended IDs apart (IDs are below 2^29). */
const idKey = (id: number, extended: boolean) => (extended ? id + 0x20000000 : id);

export function compileMap(map: CanMap): CompiledMap {
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
	const byId = new Map<number, CompiledFrame>();
	const byPgn = new Map<number, CompiledFrame>();
	map.frames.forEach((frame, frameIndex) => {
		const compiled = compileFrame(frame, frameIndex, channels.length, viewOf);
		frames.push(compiled);
		for (const s of frame.signals) {
			channels.push({ index: channels.length, frameIndex, frameName: frame.name, signalName: s.name, unit: s.unit, min: s.min, max: s.max });
		}
		// First definition wins on duplicates; lintMap reports them.
		const key = idKey(frame.id, frame.extended);
		if (!byId.has(key)) byId.set(key, compiled);
		if (frame.j1939 && frame.extended) {
			const pgn = j1939Pgn(frame.id);
			if (!byPgn.has(pgn)) byPgn.set(pgn, compiled);
		}
	});

	// Received extended IDs resolved by PGN, remembered so each distinct ID is parsed once.
	const pgnCache = new Map<number, CompiledFrame | null>();
	function lookup(id: number, extended: boolean): CompiledFrame | undefined {
		const exact = byId.get(idKey(id, extended));
		if (exact !== undefined || !extended || byPgn.size === 0 || !(id >= 0 && id <= MAX_EXTENDED_ID)) return exact;
		let found = pgnCache.get(id);
		if (found === undefined) {
			found = byPgn.get(j1939Pgn(id)) ?? null;
			pgnCache.set(id, found);
		}
		return found ?? undefined;
	}

	return { map, channels, frames, lookup };
}
