/**
 * J1939 helper pass over a capture: active trouble codes from DM1 (single frames and transport
 * transfers, SAE J1939-73 / J1939-21) and every multi-packet message reassembled, broadcast (BAM)
 * and connection mode (RTS/CTS) alike.
 */
import { parseDm1, parseJ1939Id, PGN_DM1, type Dm1Lamps, type TroubleCode } from '../j1939';
import {
	createTransportReassembler,
	type TransportMode,
	type TransportProblem
} from '../j1939-transport';
import { payloadOf, type FrameColumns } from './frame-columns';
import { FLAG_EXTENDED } from './frame-store';

export interface Dm1Message {
	time: number;
	sourceAddress: number;
	/** true when it arrived as a BAM transfer (more than one trouble code). */
	viaTransport: boolean;
	lamps: Dm1Lamps;
	troubleCodes: TroubleCode[];
}

/** One distinct (source, SPN, FMI) fault and when it was reported. */
export interface ActiveTroubleCode {
	sourceAddress: number;
	spn: number;
	fmi: number;
	occurrenceCount: number;
	firstTime: number;
	lastTime: number;
	reports: number;
}

export interface J1939Scan {
	/** DM1 messages in time order (the first MAX_LISTED). */
	dm1: Dm1Message[];
	troubleCodes: ActiveTroubleCode[];
	/** Reassembled messages with their bytes (at most 1785 each, SAE J1939-21), so a view can show them. */
	transportMessages: {
		time: number;
		mode: TransportMode;
		pgn: number;
		sourceAddress: number;
		/** The responder of an RTS/CTS transfer; 0xFF (global) for BAM. */
		destinationAddress: number;
		length: number;
		data: Uint8Array;
	}[];
	/** Transfers dropped, aborted, timed out or left incomplete (the first MAX_LISTED). */
	transportProblems: TransportProblem[];
}

const MAX_LISTED = 10_000;

export function scanJ1939(store: FrameColumns): J1939Scan {
	const scanner = createJ1939Scanner();
	scanner.add(store);
	return scanner.finish();
}

/** The J1939 pass fed a capture piece by piece in capture order (segments of the chunked store). */
export function createJ1939Scanner(): { add(columns: FrameColumns): void; finish(): J1939Scan } {
	const scan: J1939Scan = {
		dm1: [],
		troubleCodes: [],
		transportMessages: [],
		transportProblems: []
	};
	const codes = new Map<string, ActiveTroubleCode>();
	const reassembler = createTransportReassembler({
		onProblem: (p) => {
			if (scan.transportProblems.length < MAX_LISTED) scan.transportProblems.push(p);
		}
	});

	const recordDm1 = (
		time: number,
		sourceAddress: number,
		payload: Uint8Array,
		viaTransport: boolean
	) => {
		const { lamps, troubleCodes } = parseDm1(payload);
		if (scan.dm1.length < MAX_LISTED)
			scan.dm1.push({ time, sourceAddress, viaTransport, lamps, troubleCodes });
		for (const code of troubleCodes) {
			const key = `${sourceAddress}:${code.spn}:${code.fmi}`;
			const known = codes.get(key);
			if (known) {
				known.lastTime = time;
				known.reports++;
				known.occurrenceCount = code.occurrenceCount;
			} else {
				codes.set(key, {
					sourceAddress,
					spn: code.spn,
					fmi: code.fmi,
					occurrenceCount: code.occurrenceCount,
					firstTime: time,
					lastTime: time,
					reports: 1
				});
			}
		}
	};

	let lastTime = -Infinity;
	let frames = 0;
	const add = (store: FrameColumns) => {
		frames += store.count;
		for (let i = 0; i < store.count; i++) {
			if (store.time[i] > lastTime) lastTime = store.time[i];
			if ((store.flags[i] & FLAG_EXTENDED) === 0) continue;
			const id = store.id[i];
			const time = store.time[i];
			const payload = payloadOf(store, i);
			const { pgn, sourceAddress } = parseJ1939Id(id);
			if (pgn === PGN_DM1 && payload.length >= 2) recordDm1(time, sourceAddress, payload, false);
			const message = reassembler.push(id, time, payload);
			if (message) {
				if (scan.transportMessages.length < MAX_LISTED) {
					scan.transportMessages.push({
						time: message.time,
						mode: message.mode,
						pgn: message.pgn,
						sourceAddress: message.sourceAddress,
						destinationAddress: message.destinationAddress,
						length: message.data.length,
						data: message.data
					});
				}
				if (message.pgn === PGN_DM1)
					recordDm1(message.time, message.sourceAddress, message.data, true);
			}
		}
	};
	const finish = () => {
		// Transfers still open when the capture ends are reported, not silently forgotten.
		if (frames) reassembler.finish(lastTime);
		scan.troubleCodes = [...codes.values()];
		return scan;
	};
	return { add, finish };
}
