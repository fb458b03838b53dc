/**
 * The JSON the capture screens receive for one decode: everything of `decodeCapture`'s result except
 * the sample arrays (those are fetched per channel, decimated, through the series route).
 * Typed arrays become plain arrays and NaN-free numbers, so the shape survives JSON unchanged.
 */
import type { DecodeSummary, J1939Summary, TroubleCodeSummary } from '../../api/capture-views';
import type { Channel } from '../../can/capture/channels';
import type { CaptureDecoding } from '../../can/capture/decode-capture';

/** What the summary reads of a decode: everything but the channels' samples. */
export type DecodingFigures = Omit<CaptureDecoding, 'channels'> & {
	channels: readonly Omit<Channel, 'time' | 'value'>[];
};

/** JSON has no NaN or ±Infinity (a float signal can decode to them); they become null. */
const finiteOrNull = (n: number | null): number | null =>
	n !== null && Number.isFinite(n) ? n : null;

const hexOf = (bytes: Uint8Array) =>
	Array.from(bytes, (b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');

const idKey = (bus: number, id: number, extended: boolean) =>
	`${bus}:${extended ? `x${id}` : `s${id}`}`;

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

export function summarizeDecoding(result: DecodingFigures): DecodeSummary {
	const rates = new Map(result.ids.map((s) => [idKey(s.bus, s.id, s.extended), s.rateHz]));
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
			errors: c.errorCount,
			...(c.info.precision ? { precision: c.info.precision } : {}),
			role: c.info.role ?? 'value'
		})),
		ids: result.ids.map((s) => ({
			bus: s.bus,
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
			bus: u.bus,
			id: u.id,
			extended: u.extended,
			count: u.count,
			rateHz: rates.get(idKey(u.bus, u.id, u.extended)) ?? null,
			maxLength: u.maxLength,
			bitChanges: Array.from(u.bitChanges)
		})),
		busLoad: result.busLoad.windows.map((w) => ({ start: w.start, percent: w.percent })),
		j1939: result.j1939 ? summarizeJ1939(result.j1939) : null
	};
}
