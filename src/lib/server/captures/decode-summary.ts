/**
 * The JSON the capture screens receive for one decode: everything of `decodeCapture`'s result except
 * the sample arrays (those are fetched per channel, decimated, through the series route).
 * Typed arrays become plain arrays and NaN-free numbers, so the shape survives JSON unchanged.
 */
import type { CaptureDecoding } from '../../can/capture/decode-capture';
import type { Dm1Lamps } from '../../can/j1939';
import type { TransportMode } from '../../can/j1939-transport';

export interface ChannelSummary {
	index: number;
	frameName: string;
	signalName: string;
	unit: string;
	count: number;
	min: number | null;
	max: number | null;
	mean: number | null;
	last: number | null;
	/** Samples outside [limitMin, limitMax] (the signal's min/max in the map). */
	outOfRange: number;
	limitMin: number | null;
	limitMax: number | null;
	/** Samples a J1939 sender flagged as "not available" / "error" (SAE J1939-71 ranges). */
	notAvailable: number;
	errors: number;
}

export interface IdSummary {
	id: number;
	extended: boolean;
	/** The map frame's name, null for an ID the map does not define. */
	name: string | null;
	count: number;
	rateHz: number | null;
	meanPeriodMs: number | null;
	jitterMs: number | null;
	/** The cycle time the map promises, to compare with meanPeriodMs. */
	cycleMs: number | null;
	minLength: number;
	maxLength: number;
}

export interface UnknownIdSummary {
	id: number;
	extended: boolean;
	count: number;
	rateHz: number | null;
	maxLength: number;
	/** bitChanges[b]: changes of payload bit b (docs/bit-numbering.md) between consecutive frames. */
	bitChanges: number[];
}

export interface TroubleCodeSummary {
	/** When this (source, SPN, FMI) was first reported; lastTime when last. */
	time: number;
	lastTime: number;
	sourceAddress: number;
	spn: number;
	fmi: number;
	occurrenceCount: number;
	/** Lamp states of the latest DM1 that reported it. */
	lamps: Dm1Lamps;
}

export interface J1939Summary {
	troubleCodes: TroubleCodeSummary[];
	/** Reassembled transport messages: BAM (destination 0xFF) and RTS/CTS (destination = responder). */
	messages: {
		time: number;
		mode: TransportMode;
		pgn: number;
		sourceAddress: number;
		destinationAddress: number;
		length: number;
		dataHex: string;
	}[];
}

export interface DecodeSummary {
	frameCount: number;
	durationS: number;
	bitrate: number;
	channels: ChannelSummary[];
	ids: IdSummary[];
	unknownIds: UnknownIdSummary[];
	busLoad: { start: number; percent: number }[];
	j1939: J1939Summary | null;
}

/** JSON has no NaN or ±Infinity (a float signal can decode to them); they become null. */
const finiteOrNull = (n: number | null): number | null =>
	n !== null && Number.isFinite(n) ? n : null;

const hexOf = (bytes: Uint8Array) =>
	Array.from(bytes, (b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');

const idKey = (id: number, extended: boolean) => (extended ? `x${id}` : `s${id}`);

function summarizeJ1939(scan: NonNullable<CaptureDecoding['j1939']>): J1939Summary {
	// One row per distinct (source, SPN, FMI), updated by every later DM1 that repeats it.
	const codes = new Map<string, TroubleCodeSummary>();
	for (const message of scan.dm1) {
		for (const code of message.troubleCodes) {
			const key = `${message.sourceAddress}:${code.spn}:${code.fmi}`;
			const known = codes.get(key);
			if (known) {
				known.lastTime = message.time;
				known.occurrenceCount = code.occurrenceCount;
				known.lamps = message.lamps;
			} else {
				codes.set(key, {
					time: message.time,
					lastTime: message.time,
					sourceAddress: message.sourceAddress,
					spn: code.spn,
					fmi: code.fmi,
					occurrenceCount: code.occurrenceCount,
					lamps: message.lamps
				});
			}
		}
	}
	return {
		troubleCodes: [...codes.values()],
		messages: scan.transportMessages.map((m) => ({
			time: m.time,
			mode: m.mode,
			pgn: m.pgn,
			sourceAddress: m.sourceAddress,
			destinationAddress: m.destinationAddress,
			length: m.length,
			dataHex: hexOf(m.data)
		}))
	};
}

export function summarizeDecoding(result: CaptureDecoding): DecodeSummary {
	const rates = new Map(result.ids.map((s) => [idKey(s.id, s.extended), s.rateHz]));
	return {
		frameCount: result.frameCount,
		durationS: result.duration,
		bitrate: result.busLoad.bitrate,
		channels: result.channels.map((c) => ({
			index: c.info.index,
			frameName: c.info.frameName,
			signalName: c.info.signalName,
			unit: c.info.unit,
			count: c.count,
			min: finiteOrNull(c.min),
			max: finiteOrNull(c.max),
			mean: finiteOrNull(c.mean),
			last: finiteOrNull(c.last),
			outOfRange: c.outOfRangeCount,
			limitMin: c.info.min,
			limitMax: c.info.max,
			notAvailable: c.notAvailableCount,
			errors: c.errorCount
		})),
		ids: result.ids.map((s) => ({
			id: s.id,
			extended: s.extended,
			name: s.frameName,
			count: s.count,
			rateHz: s.rateHz,
			meanPeriodMs: s.meanPeriodMs,
			jitterMs: s.jitterMs,
			cycleMs: s.cycleMs,
			minLength: s.minLength,
			maxLength: s.maxLength
		})),
		unknownIds: result.unknownIds.map((u) => ({
			id: u.id,
			extended: u.extended,
			count: u.count,
			rateHz: rates.get(idKey(u.id, u.extended)) ?? null,
			maxLength: u.maxLength,
			bitChanges: Array.from(u.bitChanges)
		})),
		busLoad: result.busLoad.windows.map((w) => ({ start: w.start, percent: w.percent })),
		j1939: result.j1939 ? summarizeJ1939(result.j1939) : null
	};
}
