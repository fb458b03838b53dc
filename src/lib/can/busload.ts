/**
 * Bus load: the share of bus time that frames occupy, from a map's cycle times (planning) or from
 * a capture's actual frames (measurement). CAN FD frames (payloads over 8 bytes) send their data
 * phase at the data bit rate (fd-frame-bits.ts); their load is expressed in nominal bit times,
 * so every percentage is busy time over elapsed time. See docs/can-fd-and-transport.md.
 */
import { z } from 'zod';
import type { CanMap } from './map';
import {
	fdNominalPhaseBits,
	fdWorstCasePhaseBits,
	type FdFrameOptions,
	type FdPhaseBits
} from './fd-frame-bits';
import {
	CLASSICAL_MAX_LENGTH,
	frameBits,
	frameStuffBitsAt,
	interFrameBits,
	nominalFrameBits,
	worstCaseFrameBits
} from './frame-bits';

export const busLoadExclusionSchema = z.enum(['noCycleTime']);
export type BusLoadExclusion = z.infer<typeof busLoadExclusionSchema>;

export const frameBusLoadSchema = z.object({
	frameIndex: z.number().int(),
	name: z.string(),
	id: z.number().int(),
	framesPerSecond: z.number(),
	/** Bus time per second in nominal bit times (an FD data phase bit weighs bitrate / dataBitrate). */
	nominalBitsPerSecond: z.number(),
	worstCaseBitsPerSecond: z.number(),
	nominalPercent: z.number(),
	worstCasePercent: z.number(),
	/** Why the frame contributes nothing to the totals, or null when it counts. */
	excluded: busLoadExclusionSchema.nullable()
});
export type FrameBusLoad = z.infer<typeof frameBusLoadSchema>;

export const mapBusLoadSchema = z.object({
	/** Nominal (arbitration) bit rate; the percentages are of this rate's bit times. */
	bitrate: z.number(),
	/** Bit rate of CAN FD data phases (equal to `bitrate` when none was given). */
	dataBitrate: z.number(),
	nominalPercent: z.number(),
	worstCasePercent: z.number(),
	frames: z.array(frameBusLoadSchema)
});
export type MapBusLoad = z.infer<typeof mapBusLoadSchema>;

function checkPositive(value: number, what: string): void {
	if (!Number.isFinite(value) || value <= 0) {
		throw new RangeError(`${what} must be a positive number, got ${value}`);
	}
}

/**
 * Checks a nominal / data bit rate pair. A data phase slower than the arbitration phase is refused:
 * it defeats the purpose of the switch, and the FD worst-case bound assumes it does not happen.
 */
export function checkBitrates(bitrate: number, dataBitrate: number): void {
	checkPositive(bitrate, 'bit rate');
	checkPositive(dataBitrate, 'data bit rate');
	if (dataBitrate < bitrate) {
		throw new RangeError(
			`the data bit rate (${dataBitrate}) must be at least the nominal bit rate (${bitrate})`
		);
	}
}

/**
 * Bus time of FD phase bits plus the intermission, in nominal bit times: the data phase's bits
 * weigh bitrate / dataBitrate each. Exact for classical frames (no data phase bits).
 */
export function nominalBitTimes(phases: FdPhaseBits, bitrate: number, dataBitrate: number): number {
	return phases.arbitrationBits + interFrameBits + phases.dataPhaseBits * (bitrate / dataBitrate);
}

/**
 * Planned bus load of a map from its frames' cycle times, in percent of bus time at the nominal bit
 * rate (map.bitrate unless `bitrate` is given). Per frame and second:
 * - nominal = (unstuffed bits SOF…EOF + 3-bit intermission) × frames per second — no stuffing
 *   estimate, so it is the floor the bus can never go below;
 * - worst case = Davis et al. 2007 bound (already including the intermission) × frames per second.
 * CAN FD frames (more than 8 bytes) count their data phase at `dataBitrate` (default: the nominal
 * rate, i.e. no switch): nominal = fdNominalPhaseBits (fixed stuff bits, no dynamic ones), worst
 * case = fdWorstCasePhaseBits, both plus the intermission, in nominal bit times.
 * Frames without a cycle time (event-driven or unknown) are listed with zero load.
 */
export function mapBusLoad(
	map: CanMap,
	bitrate: number = map.bitrate,
	dataBitrate: number = bitrate
): MapBusLoad {
	checkBitrates(bitrate, dataBitrate);
	// A map says nothing about BRS; with no data bit rate given both rates are equal, so assuming
	// the switch changes nothing, and with one given the switch is what it is for.
	const fd: FdFrameOptions = { bitRateSwitch: true };
	let nominal = 0;
	let worst = 0;
	const frames = map.frames.map((frame, frameIndex): FrameBusLoad => {
		const excluded: BusLoadExclusion | null = frame.cycleMs == null ? 'noCycleTime' : null;
		const framesPerSecond = excluded === null && frame.cycleMs ? 1000 / frame.cycleMs : 0;
		const isFd = frame.length > CLASSICAL_MAX_LENGTH;
		const nominalBits = isFd
			? nominalBitTimes(fdNominalPhaseBits(frame.length, frame.extended, fd), bitrate, dataBitrate)
			: nominalFrameBits(frame.length, frame.extended) + interFrameBits;
		const worstBits = isFd
			? nominalBitTimes(
					fdWorstCasePhaseBits(frame.length, frame.extended, fd),
					bitrate,
					dataBitrate
				)
			: worstCaseFrameBits(frame.length, frame.extended);
		const nominalBitsPerSecond = excluded ? 0 : framesPerSecond * nominalBits;
		const worstCaseBitsPerSecond = excluded ? 0 : framesPerSecond * worstBits;
		nominal += nominalBitsPerSecond;
		worst += worstCaseBitsPerSecond;
		return {
			frameIndex,
			name: frame.name,
			id: frame.id,
			framesPerSecond,
			nominalBitsPerSecond,
			worstCaseBitsPerSecond,
			nominalPercent: (100 * nominalBitsPerSecond) / bitrate,
			worstCasePercent: (100 * worstCaseBitsPerSecond) / bitrate,
			excluded
		};
	});
	return {
		bitrate,
		dataBitrate,
		nominalPercent: (100 * nominal) / bitrate,
		worstCasePercent: (100 * worst) / bitrate,
		frames
	};
}

/**
 * Bus time one received classical frame took, in bits: the exact frame with its own stuff bits,
 * plus the 3-bit intermission. Use as the per-frame count for captureBusLoad.
 */
export function frameBusBits(id: number, extended: boolean, data: Uint8Array): number {
	const { bits, stuffBits } = frameBits(id, extended, data);
	return bits + stuffBits + interFrameBits;
}

/**
 * frameBusBits of the frame whose payload is `bytes[offset … offset + length)`, e.g. a capture's
 * payload pool: the same count without a payload view per frame.
 */
export function frameBusBitsAt(
	id: number,
	extended: boolean,
	bytes: Uint8Array,
	offset: number,
	length: number
): number {
	return (
		nominalFrameBits(length, extended) +
		frameStuffBitsAt(id, extended, bytes, offset, length) +
		interFrameBits
	);
}

/** Most windows captureBusLoad will produce, so a typo in the window size cannot exhaust memory. */
export const MAX_LOAD_WINDOWS = 1_000_000;

/**
 * Measured bus load of a capture over fixed windows: each frame's bit count is added to the window
 * holding its timestamp (a frame crossing a window edge is counted whole in its own window).
 * Windows start at the earliest timestamp; empty windows are reported with 0 %.
 * `times` in seconds (any order), `frameBitCounts[i]` the bus time of frame i in nominal bit times
 * (see frameBusBits, and nominalBitTimes for CAN FD frames).
 */
export function captureBusLoad(
	times: Float64Array,
	frameBitCounts: Float64Array | Uint16Array,
	bitrate: number,
	windowSeconds: number
): { start: number; percent: number }[] {
	checkPositive(bitrate, 'bit rate');
	checkPositive(windowSeconds, 'window length');
	if (times.length !== frameBitCounts.length) {
		throw new RangeError(
			`times (${times.length}) and frame bit counts (${frameBitCounts.length}) must have the same length`
		);
	}
	if (times.length === 0) return [];
	let first = Infinity;
	let last = -Infinity;
	for (const t of times) {
		if (!Number.isFinite(t)) throw new RangeError(`frame times must be finite numbers, got ${t}`);
		if (t < first) first = t;
		if (t > last) last = t;
	}
	const count = Math.floor((last - first) / windowSeconds) + 1;
	if (count > MAX_LOAD_WINDOWS) {
		throw new RangeError(
			`${count} windows of ${windowSeconds} s needed; ` +
				`choose a window of at least ${(last - first) / MAX_LOAD_WINDOWS} s`
		);
	}
	const bits = new Float64Array(count);
	for (let i = 0; i < times.length; i++) {
		bits[Math.min(count - 1, Math.floor((times[i] - first) / windowSeconds))] += frameBitCounts[i];
	}
	const capacity = bitrate * windowSeconds;
	return Array.from(bits, (b, k) => ({
		start: first + k * windowSeconds,
		percent: (100 * b) / capacity
	}));
}
