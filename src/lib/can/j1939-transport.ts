/**
 * SAE J1939-21 transport protocol: messages of more than 8 bytes sent as a TP.CM (connection
 * management, PGN 0xEC00) frame and TP.DT (data transfer, PGN 0xEB00) packets of 7 bytes each,
 * reassembled from a stream of received frames, as a bus monitor sees them. Two modes:
 * - BAM, broadcast announce message, to the global address: announce, then the packets;
 * - connection mode, to one destination address: the originator asks (RTS), the responder grants
 *   windows of packets (CTS), the originator sends them, the responder acknowledges the whole
 *   message (EndOfMsgACK); either side can give up (Conn_Abort, with a reason code).
 * A message is returned only when every byte arrived (and, in connection mode, the responder
 * acknowledged it); anything else is reported through `onProblem`, never returned half-filled.
 * Rules and reporting: docs/can-fd-and-transport.md. Pure: runs in the browser, server and CLI.
 */
import { GLOBAL_ADDRESS, parseJ1939Id } from './j1939';

/** TP.CM, connection management. SAE J1939-21. */
export const PGN_TP_CM = 0xec00;
/** TP.DT, data transfer. SAE J1939-21. */
export const PGN_TP_DT = 0xeb00;
/** TP.CM control bytes. SAE J1939-21. */
export const TP_CM_RTS = 16;
export const TP_CM_CTS = 17;
export const TP_CM_END_OF_MSG_ACK = 19;
export const TP_CM_BAM = 32;
export const TP_CM_ABORT = 255;
/** Data bytes per TP.DT packet (byte 0 is the sequence number). SAE J1939-21. */
export const TP_DT_BYTES = 7;
/** Largest transport message: 255 packets × 7 bytes. SAE J1939-21. */
export const TP_MAX_SIZE = 255 * TP_DT_BYTES;
/** Smallest connection-mode message: anything up to 8 bytes fits one frame. SAE J1939-21. */
export const TP_MIN_CONNECTION_SIZE = 9;
/** Receiver timeout T1 between packets, 750 ms (SAE J1939-21, from memory). */
export const TP_T1_SECONDS = 0.75;

/**
 * Connection-mode deadlines in seconds, SAE J1939-21 (from memory):
 * - t1 = 750 ms: the responder waits at most this long between packets of a granted window;
 * - t2 = 1250 ms: the responder waits at most this long after a CTS for the first packet;
 * - t3 = 1250 ms: the originator waits at most this long after the last packet of a window (or
 *   after the RTS) for the next CTS or the EndOfMsgACK;
 * - t4 = 1050 ms: the originator waits at most this long after a CTS of 0 packets ("hold the
 *   connection open") for the next CTS.
 * Not checked here: Tr = 200 ms (how fast a node must answer) and Th = 500 ms (how often a
 * holding responder repeats its CTS of 0): a late answer within the limits above still works.
 */
export const J1939_TP_TIMEOUTS = { t1: 0.75, t2: 1.25, t3: 1.25, t4: 1.05 } as const;
export type ConnectionTimeouts = { [K in keyof typeof J1939_TP_TIMEOUTS]: number };

/** Conn_Abort reason codes 1–8 of SAE J1939-21 (from memory); other codes are shown as numbers. */
export const ABORT_REASONS: Readonly<Record<number, string>> = {
	1: 'already in one or more connection-managed sessions and cannot support another',
	2: 'system resources were needed for another task',
	3: 'a timeout occurred',
	4: 'CTS received while a data transfer was in progress',
	5: 'maximum retransmit request limit reached',
	6: 'unexpected data transfer packet',
	7: 'bad sequence number',
	8: 'duplicate sequence number'
};

export type TransportMode = 'bam' | 'rts-cts';

export interface TransportMessage {
	mode: TransportMode;
	pgn: number;
	sourceAddress: number;
	/** The responder in connection mode; the global address 0xFF for BAM. */
	destinationAddress: number;
	data: Uint8Array;
	/** Time of the last packet (BAM) or of the EndOfMsgACK (RTS/CTS), in the caller's time unit. */
	time: number;
}

export type TransportProblemKind =
	'malformed' | 'outOfOrder' | 'timeout' | 'replaced' | 'aborted' | 'incomplete';
export interface TransportProblem {
	kind: TransportProblemKind;
	mode: TransportMode;
	/** Sender of the message being transferred (the originator in connection mode). */
	sourceAddress: number;
	destinationAddress: number;
	/** PGN of the message being transferred, when known. */
	pgn: number | null;
	/** Conn_Abort reason code, for kind 'aborted'. */
	abortReason: number | null;
	time: number;
	message: string;
}

export interface TransportReassemblerOptions {
	/** Called for each transfer that is rejected or abandoned; the transfer is dropped. */
	onProblem?: (problem: TransportProblem) => void;
	/** BAM: longest gap between packets before a transfer is abandoned, same unit as `time`. */
	timeout?: number;
	/** Connection mode: deadlines in the unit of `time` (default J1939_TP_TIMEOUTS, seconds). */
	connectionTimeouts?: Partial<ConnectionTimeouts>;
}

export interface TransportReassembler {
	/** Feeds one received frame; returns a completed message or null. Non-transport frames are ignored. */
	push(id: number, time: number, data: Uint8Array): TransportMessage | null;
	/** The stream ended at `time`: every transfer still open is reported (timed out or incomplete). */
	finish(time: number): void;
	/** Number of transfers currently in progress. */
	readonly pending: number;
}

interface BamTransfer {
	pgn: number;
	size: number;
	packets: number;
	received: number;
	lastTime: number;
	buffer: Uint8Array;
}

type SessionState = 'awaitCts' | 'hold' | 'window' | 'awaitAck';

interface Session {
	originator: number;
	responder: number;
	pgn: number;
	size: number;
	packets: number;
	buffer: Uint8Array;
	/** have[k] = 1 once packet k + 1 arrived. */
	have: Uint8Array;
	haveCount: number;
	state: SessionState;
	/** In a window: the next packet number expected and the window's last one. */
	next: number;
	windowEnd: number;
	/** Whether a packet of the current window arrived (T1 then applies instead of T2). */
	windowStarted: boolean;
	lastTime: number;
}

/** The timer that limits the wait in each state, and what is being waited for. */
const WAIT: Record<
	SessionState,
	(s: Session) => { timer: keyof ConnectionTimeouts; what: string }
> = {
	awaitCts: () => ({ timer: 't3', what: 'CTS' }),
	hold: () => ({ timer: 't4', what: 'CTS after the hold' }),
	window: (s) =>
		s.windowStarted
			? { timer: 't1', what: `packet ${s.next}` }
			: { timer: 't2', what: `first packet of the window (${s.next})` },
	awaitAck: () => ({ timer: 't3', what: 'EndOfMsgACK' })
};

const hex = (byte: number) => byte.toString(16).toUpperCase().padStart(2, '0');
const pgnText = (pgn: number) => `0x${pgn.toString(16).toUpperCase().padStart(4, '0')}`;
const pgnOf = (data: Uint8Array) => data[5] | (data[6] << 8) | ((data[7] & 0x03) << 16);

/** Packet numbers still missing, as "3, 4, 9" (at most 10 listed). */
function missingText(s: Session): string {
	const missing: number[] = [];
	for (let k = 0; k < s.packets; k++) if (!s.have[k]) missing.push(k + 1);
	const shown = missing.slice(0, 10).join(', ');
	return missing.length > 10 ? `${shown} … (${missing.length} in all)` : shown;
}

export function createTransportReassembler(
	options: TransportReassemblerOptions = {}
): TransportReassembler {
	const bamTimeout = options.timeout ?? TP_T1_SECONDS;
	const timeouts: ConnectionTimeouts = { ...J1939_TP_TIMEOUTS, ...options.connectionTimeouts };
	const transfers = new Map<number, BamTransfer>();
	const sessions = new Map<number, Session>();
	/** No session deadline falls before this time (a lower bound; a sweep recomputes it). */
	let nextDeadline = Infinity;

	const report = (problem: Omit<TransportProblem, 'abortReason'> & { abortReason?: number }) =>
		options.onProblem?.({ ...problem, abortReason: problem.abortReason ?? null });

	// ---- BAM ------------------------------------------------------------------------------------

	const dropBam = (sa: number, kind: TransportProblemKind, time: number, message: string) => {
		const pgn = transfers.get(sa)?.pgn ?? null;
		transfers.delete(sa);
		report({
			kind,
			mode: 'bam',
			sourceAddress: sa,
			destinationAddress: GLOBAL_ADDRESS,
			pgn,
			time,
			message
		});
	};

	function announce(sa: number, time: number, data: Uint8Array): null {
		if (data.length < 8) {
			dropBam(sa, 'malformed', time, `TP.CM from 0x${hex(sa)} has ${data.length} bytes, needs 8`);
			return null;
		}
		const size = data[1] | (data[2] << 8);
		const packets = data[3];
		const pgn = pgnOf(data);
		if (transfers.has(sa)) {
			dropBam(sa, 'replaced', time, `new BAM from 0x${hex(sa)} before the previous one completed`);
		}
		if (size < 1 || size > TP_MAX_SIZE || packets !== Math.ceil(size / TP_DT_BYTES)) {
			report({
				kind: 'malformed',
				mode: 'bam',
				sourceAddress: sa,
				destinationAddress: GLOBAL_ADDRESS,
				pgn,
				time,
				message:
					`BAM from 0x${hex(sa)} announces ${size} bytes in ${packets} packets; ` +
					`expected 1…${TP_MAX_SIZE} bytes in ⌈size/7⌉ packets`
			});
			return null;
		}
		transfers.set(sa, {
			pgn,
			size,
			packets,
			received: 0,
			lastTime: time,
			buffer: new Uint8Array(packets * TP_DT_BYTES)
		});
		return null;
	}

	function bamPacket(sa: number, time: number, data: Uint8Array): TransportMessage | null {
		const t = transfers.get(sa);
		if (!t) return null; // a packet of a transfer we did not see start
		if (data.length < 8) {
			dropBam(sa, 'malformed', time, `TP.DT from 0x${hex(sa)} has ${data.length} bytes, needs 8`);
			return null;
		}
		if (time - t.lastTime > bamTimeout) {
			const gap = Number((time - t.lastTime).toPrecision(4));
			dropBam(
				sa,
				'timeout',
				time,
				`BAM from 0x${hex(sa)}: ${gap} between packets exceeds ${bamTimeout}`
			);
			return null;
		}
		const sequence = data[0];
		if (sequence !== t.received + 1) {
			const expected = t.received + 1;
			dropBam(
				sa,
				'outOfOrder',
				time,
				`BAM from 0x${hex(sa)}: packet ${sequence} arrived, expected ${expected}`
			);
			return null;
		}
		t.buffer.set(data.subarray(1, 8), t.received * TP_DT_BYTES);
		t.received = sequence;
		t.lastTime = time;
		if (t.received < t.packets) return null;
		transfers.delete(sa);
		// The last packet is padded with 0xFF; the announced size says where the message ends.
		return {
			mode: 'bam',
			pgn: t.pgn,
			sourceAddress: sa,
			destinationAddress: GLOBAL_ADDRESS,
			data: t.buffer.slice(0, t.size),
			time
		};
	}

	// ---- connection mode (RTS/CTS) --------------------------------------------------------------

	/** One session per (originator, responder) pair and direction, as J1939-21 allows. */
	const key = (originator: number, responder: number) => (originator << 8) | responder;
	const label = (s: Pick<Session, 'originator' | 'responder' | 'pgn'>) =>
		`RTS/CTS 0x${hex(s.originator)}→0x${hex(s.responder)} PGN ${pgnText(s.pgn)}`;
	const deadlineOf = (s: Session) => s.lastTime + timeouts[WAIT[s.state](s).timer];

	const endSession = (
		s: Session,
		kind: TransportProblemKind,
		time: number,
		message: string,
		abortReason?: number
	) => {
		sessions.delete(key(s.originator, s.responder));
		report({
			kind,
			mode: 'rts-cts',
			sourceAddress: s.originator,
			destinationAddress: s.responder,
			pgn: s.pgn,
			time,
			message: `${label(s)}: ${message}`,
			abortReason
		});
	};

	/** Moves a session on: new state, its timer restarted at `time`. */
	const touch = (s: Session, state: SessionState, time: number) => {
		s.state = state;
		s.lastTime = time;
		nextDeadline = Math.min(nextDeadline, deadlineOf(s));
	};

	/** Ends every session whose deadline passed before `time`, reported at its deadline. */
	function sweep(time: number) {
		if (time <= nextDeadline) return;
		nextDeadline = Infinity;
		for (const s of [...sessions.values()]) {
			const deadline = deadlineOf(s);
			if (time > deadline) {
				const { timer, what } = WAIT[s.state](s);
				endSession(
					s,
					'timeout',
					deadline,
					`no ${what} within ${timer.toUpperCase()} (${timeouts[timer]}); ` +
						`${s.haveCount} of ${s.packets} packets had arrived`
				);
			} else nextDeadline = Math.min(nextDeadline, deadline);
		}
	}

	function requestToSend(originator: number, responder: number, time: number, data: Uint8Array) {
		const size = data[1] | (data[2] << 8);
		const packets = data[3];
		const pgn = pgnOf(data);
		const old = sessions.get(key(originator, responder));
		if (old) endSession(old, 'replaced', time, 'a new RTS arrived before this transfer completed');
		if (
			size < TP_MIN_CONNECTION_SIZE ||
			size > TP_MAX_SIZE ||
			packets !== Math.ceil(size / TP_DT_BYTES)
		) {
			report({
				kind: 'malformed',
				mode: 'rts-cts',
				sourceAddress: originator,
				destinationAddress: responder,
				pgn,
				time,
				message:
					`${label({ originator, responder, pgn })}: RTS announces ${size} bytes in ${packets} ` +
					`packets; expected ${TP_MIN_CONNECTION_SIZE}…${TP_MAX_SIZE} bytes in ⌈size/7⌉ packets`
			});
			return;
		}
		const s: Session = {
			originator,
			responder,
			pgn,
			size,
			packets,
			buffer: new Uint8Array(packets * TP_DT_BYTES),
			have: new Uint8Array(packets),
			haveCount: 0,
			state: 'awaitCts',
			next: 0,
			windowEnd: 0,
			windowStarted: false,
			lastTime: time
		};
		sessions.set(key(originator, responder), s);
		touch(s, 'awaitCts', time);
	}

	function clearToSend(s: Session, time: number, data: Uint8Array) {
		const count = data[1];
		const next = data[2];
		if (count === 0) return touch(s, 'hold', time);
		if (next < 1 || next > s.packets) {
			return endSession(
				s,
				'malformed',
				time,
				`CTS asks for packet ${next}, but the message has packets 1…${s.packets}`
			);
		}
		// A CTS may also ask again for packets already sent (retransmission, J1939-21); a new CTS
		// replaces any window still open.
		s.next = next;
		s.windowEnd = Math.min(s.packets, next + count - 1);
		s.windowStarted = false;
		touch(s, 'window', time);
	}

	function connectionPacket(s: Session, time: number, data: Uint8Array) {
		if (data.length < 8) {
			return endSession(s, 'malformed', time, `TP.DT has ${data.length} bytes, needs 8`);
		}
		const sequence = data[0];
		if (s.state !== 'window') {
			return endSession(
				s,
				'outOfOrder',
				time,
				`packet ${sequence} arrived while no CTS window was open`
			);
		}
		if (sequence < s.next || sequence > s.windowEnd) {
			return endSession(
				s,
				'outOfOrder',
				time,
				`packet ${sequence} arrived, expected ${s.next}…${s.windowEnd} in order`
			);
		}
		// A jump past `next` means packets were lost: they stay missing unless a later CTS asks for
		// them again, and the message is reported incomplete rather than returned with a hole.
		const at = (sequence - 1) * TP_DT_BYTES;
		s.buffer.set(data.subarray(1, 8), at);
		if (!s.have[sequence - 1]) {
			s.have[sequence - 1] = 1;
			s.haveCount++;
		}
		s.next = sequence + 1;
		s.windowStarted = true;
		if (s.next <= s.windowEnd) touch(s, 'window', time);
		else touch(s, s.haveCount === s.packets ? 'awaitAck' : 'awaitCts', time);
	}

	function endOfMessage(s: Session, time: number, data: Uint8Array): TransportMessage | null {
		const size = data[1] | (data[2] << 8);
		const packets = data[3];
		if (size !== s.size || packets !== s.packets) {
			endSession(
				s,
				'malformed',
				time,
				`EndOfMsgACK for ${size} bytes in ${packets} packets, but the RTS announced ` +
					`${s.size} bytes in ${s.packets}`
			);
			return null;
		}
		if (s.haveCount < s.packets) {
			endSession(
				s,
				'incomplete',
				time,
				`EndOfMsgACK after ${s.haveCount} of ${s.packets} packets; missing ${missingText(s)}`
			);
			return null;
		}
		sessions.delete(key(s.originator, s.responder));
		return {
			mode: 'rts-cts',
			pgn: s.pgn,
			sourceAddress: s.originator,
			destinationAddress: s.responder,
			data: s.buffer.slice(0, s.size),
			time
		};
	}

	function abort(sender: number, receiver: number, time: number, data: Uint8Array) {
		const reason = data[1];
		const pgn = pgnOf(data);
		const named = ABORT_REASONS[reason];
		// Either side may abort: the sender is the originator of one session or the responder of the other.
		for (const [s, by] of [
			[sessions.get(key(sender, receiver)), 'originator'],
			[sessions.get(key(receiver, sender)), 'responder']
		] as const) {
			if (!s || s.pgn !== pgn) continue;
			endSession(
				s,
				'aborted',
				time,
				`Conn_Abort by the ${by}, reason ${reason}${named ? ` (${named})` : ''}, after ` +
					`${s.haveCount} of ${s.packets} packets`,
				reason
			);
		}
	}

	function connectionMode(sa: number, da: number, pgn: number, time: number, data: Uint8Array) {
		if (pgn === PGN_TP_DT) {
			const s = sessions.get(key(sa, da));
			if (s) connectionPacket(s, time, data);
			return null;
		}
		if (data.length < 8) {
			report({
				kind: 'malformed',
				mode: 'rts-cts',
				sourceAddress: sa,
				destinationAddress: da,
				pgn: null,
				time,
				message: `TP.CM from 0x${hex(sa)} to 0x${hex(da)} has ${data.length} bytes, needs 8`
			});
			return null;
		}
		// CTS and EndOfMsgACK come from the responder: the session is keyed (their DA, their SA).
		const answered = sessions.get(key(da, sa));
		switch (data[0]) {
			case TP_CM_RTS:
				requestToSend(sa, da, time, data);
				return null;
			case TP_CM_CTS:
				if (answered && answered.pgn === pgnOf(data)) clearToSend(answered, time, data);
				return null;
			case TP_CM_END_OF_MSG_ACK:
				return answered && answered.pgn === pgnOf(data) ? endOfMessage(answered, time, data) : null;
			case TP_CM_ABORT:
				abort(sa, da, time, data);
				return null;
			case TP_CM_BAM:
				report({
					kind: 'malformed',
					mode: 'bam',
					sourceAddress: sa,
					destinationAddress: da,
					pgn: pgnOf(data),
					time,
					message: `BAM from 0x${hex(sa)} addressed to 0x${hex(da)}; a BAM goes to the global address`
				});
				return null;
			default:
				return null;
		}
	}

	return {
		push(id, time, data) {
			sweep(time);
			const { pgn, destinationAddress, sourceAddress } = parseJ1939Id(id);
			if (pgn !== PGN_TP_CM && pgn !== PGN_TP_DT) return null;
			if (destinationAddress !== GLOBAL_ADDRESS) {
				return connectionMode(sourceAddress, destinationAddress!, pgn, time, data);
			}
			// To the global address: BAM. Connection management is never broadcast; RTS to 0xFF is refused.
			if (pgn === PGN_TP_DT) return bamPacket(sourceAddress, time, data);
			if (data[0] === TP_CM_BAM) return announce(sourceAddress, time, data);
			if (data[0] === TP_CM_RTS) {
				report({
					kind: 'malformed',
					mode: 'rts-cts',
					sourceAddress,
					destinationAddress: GLOBAL_ADDRESS,
					pgn: data.length >= 8 ? pgnOf(data) : null,
					time,
					message: `RTS from 0x${hex(sourceAddress)} to the global address; connection mode needs one destination`
				});
			}
			return null;
		},
		finish(time) {
			sweep(time);
			for (const s of [...sessions.values()]) {
				endSession(
					s,
					'incomplete',
					time,
					`the capture ended while waiting for ${WAIT[s.state](s).what}; ` +
						`${s.haveCount} of ${s.packets} packets had arrived`
				);
			}
			for (const [sa, t] of [...transfers]) {
				const late = time - t.lastTime > bamTimeout;
				dropBam(
					sa,
					late ? 'timeout' : 'incomplete',
					time,
					`BAM from 0x${hex(sa)}: ${t.received} of ${t.packets} packets before ` +
						(late ? `a gap longer than ${bamTimeout}` : 'the capture ended')
				);
			}
		},
		get pending() {
			return transfers.size + sessions.size;
		}
	};
}
