/**
 * Whole-map checks that a single-field schema cannot express: overlapping bits, fields past the
 * payload, duplicates, identifier ranges, multiplexing mistakes. Errors make decoding wrong or
 * ambiguous; warnings are legal but probably unintended.
 */
import { z } from 'zod';
import { alertRuleProblemCodeSchema, validateAlertRules } from './alerts/validate';
import { fieldBitPositions, fieldLayout } from './bits';
import { rawBounds } from './codec';
import { j1939Pgn } from './j1939';
import { MAX_STANDARD_ID, type CanMap, type Frame, type Signal } from './map';
import { formatCanId } from './map-json';

/** Codes of map-level problems; alert-rule problems follow as `alert-<code>`. */
const mapLintCodes = z.enum([
	'signal-overlap',
	'beyond-payload',
	'duplicate-frame-id',
	'duplicate-pgn',
	'duplicate-frame-name',
	'duplicate-signal-name',
	'standard-id-range',
	'zero-scale',
	'min-above-max',
	'float-length',
	'j1939-standard-id',
	'mux-without-multiplexer',
	'multiple-multiplexers',
	'nested-multiplexer',
	'mux-value-out-of-range',
	'label-out-of-range',
	'limit-unreachable',
	'checksum-length',
	'role-scaled'
]);

export const lintCodeSchema = z.union([
	mapLintCodes,
	z.templateLiteral(['alert-', alertRuleProblemCodeSchema])
]);
export type LintCode = z.infer<typeof lintCodeSchema>;

/** One problem of a map: the API answers these, the CLI prints them (docs/map-format.md lists the codes). */
export const lintProblemSchema = z.object({
	severity: z.enum(['error', 'warning']),
	code: lintCodeSchema,
	message: z.string(),
	frameIndex: z.number().int().nullable(),
	signalIndex: z.number().int().nullable(),
	/** JSON path of the field to fix, e.g. `frames[1].signals[3].startBit`. */
	path: z.string()
});
export type LintProblem = z.infer<typeof lintProblemSchema>;

type Report = (
	problem: Omit<LintProblem, 'frameIndex' | 'signalIndex' | 'path'>,
	field?: string
) => void;

const framePath = (f: number) => `frames[${f}]`;
const signalPath = (f: number, s: number) => `frames[${f}].signals[${s}]`;

/** Bits a signal occupies inside the payload, as a bit set (bit p of the BigInt = payload bit p). */
function bitSet(signal: Signal): bigint {
	let set = 0n;
	for (const p of fieldBitPositions(signal.startBit, signal.length, signal.byteOrder))
		if (p >= 0) set |= 1n << BigInt(p);
	return set;
}

/** "bits 8–15, 20" from a bit set. */
function describeBits(set: bigint): string {
	const ranges: string[] = [];
	let p = 0;
	while (set >> BigInt(p)) {
		if ((set >> BigInt(p)) & 1n) {
			const from = p;
			while ((set >> BigInt(p + 1)) & 1n) p++;
			ranges.push(from === p ? `${from}` : `${from}–${p}`);
		}
		p++;
	}
	return `${ranges.length === 1 && !ranges[0].includes('–') ? 'bit' : 'bits'} ${ranges.join(', ')}`;
}

/**
 * For bit clashes: a multiplexer's bits are in every payload; other signals only on their mux page
 * (null = every page).
 */
function pageOf(signal: Signal): number | null {
	return signal.multiplexer ? null : signal.muxValue;
}

/** Whether two signals of one frame can be in the same received payload (so shared bits clash). */
export function presentTogether(a: Signal, b: Signal): boolean {
	const pageA = pageOf(a);
	const pageB = pageOf(b);
	return pageA === null || pageB === null || pageA === pageB;
}

/**
 * Counters and checksums (docs/map-format.md, "Signal roles"): the checksums the field proposals
 * recognise are one byte long, and neither role is a physical quantity, so a scale or offset on
 * them is probably a slip. A counter without a checksum beside it is fine.
 */
function lintRole(signal: Signal, report: Report): void {
	if (signal.role === 'value') return;
	if (signal.role === 'checksum' && signal.length > 8) {
		report(
			{
				severity: 'warning',
				code: 'checksum-length',
				message: `"${signal.name}" is marked as a checksum but is ${signal.length} bits long; the checksums Framewright recognises are 8 bits`
			},
			'length'
		);
	}
	if (signal.scale !== 1 || signal.offset !== 0 || signal.valueType.startsWith('float')) {
		report(
			{
				severity: 'warning',
				code: 'role-scaled',
				message: `"${signal.name}" is marked as a ${signal.role}, whose raw value is what counts, but has ${signal.valueType.startsWith('float') ? `type ${signal.valueType}` : `scale ${signal.scale} and offset ${signal.offset}`}`
			},
			signal.valueType.startsWith('float') ? 'valueType' : 'scale'
		);
	}
}

function lintSignal(frame: Frame, signal: Signal, report: Report): void {
	const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
	if (layout.lowByte < 0) {
		report(
			{
				severity: 'error',
				code: 'beyond-payload',
				message: `"${signal.name}" is big-endian and ${signal.length} bits long, so with start bit ${signal.startBit} it would run before byte 0`
			},
			'startBit'
		);
	} else if (layout.highByte >= frame.length) {
		report(
			{
				severity: 'error',
				code: 'beyond-payload',
				message: `"${signal.name}" uses byte ${layout.highByte} but the frame carries ${frame.length} byte(s)`
			},
			'startBit'
		);
	}
	if (signal.scale === 0) {
		report(
			{
				severity: 'error',
				code: 'zero-scale',
				message: `"${signal.name}" has scale 0: every raw value would read as the offset`
			},
			'scale'
		);
	}
	if (signal.min !== null && signal.max !== null && signal.min > signal.max) {
		report(
			{
				severity: 'error',
				code: 'min-above-max',
				message: `"${signal.name}" has min ${signal.min} above max ${signal.max}`
			},
			'min'
		);
	}
	const floatLength =
		signal.valueType === 'float32' ? 32 : signal.valueType === 'float64' ? 64 : null;
	if (floatLength !== null && signal.length !== floatLength) {
		report(
			{
				severity: 'error',
				code: 'float-length',
				message: `"${signal.name}" is ${signal.valueType}, which must be ${floatLength} bits long, not ${signal.length}`
			},
			'length'
		);
	}
	lintRole(signal, report);
	if (floatLength === null) {
		const { lo, hi } = rawBounds(signal);
		const outside = Object.keys(signal.labels).filter(
			(key) => BigInt(key) < lo || BigInt(key) > hi
		);
		if (outside.length > 0) {
			report(
				{
					severity: 'warning',
					code: 'label-out-of-range',
					message: `"${signal.name}" has label(s) for raw ${outside.join(', ')}, outside its raw range ${lo}…${hi}`
				},
				'labels'
			);
		}
		// A limit the field can never reach means a warning that can never fire, or one that always fires.
		const ends = [
			Number(lo) * signal.scale + signal.offset,
			Number(hi) * signal.scale + signal.offset
		];
		const [low, high] = [Math.min(...ends), Math.max(...ends)];
		if (
			signal.scale !== 0 &&
			((signal.min !== null && signal.min > high) || (signal.max !== null && signal.max < low))
		) {
			report(
				{
					severity: 'warning',
					code: 'limit-unreachable',
					message: `"${signal.name}" can only carry ${low}…${high}, so its min/max ${signal.min ?? '–'}…${signal.max ?? '–'} cannot be met`
				},
				signal.min !== null && signal.min > high ? 'min' : 'max'
			);
		}
	}
}

function lintFrameSignals(frame: Frame, f: number, problems: LintProblem[]): void {
	const multiplexers = frame.signals.flatMap((s, i) => (s.multiplexer ? [i] : []));
	const names = new Map<string, number>();
	const sets = frame.signals.map(bitSet);

	frame.signals.forEach((signal, s) => {
		const report: Report = (p, field) =>
			problems.push({
				...p,
				frameIndex: f,
				signalIndex: s,
				path: field ? `${signalPath(f, s)}.${field}` : signalPath(f, s)
			});
		lintSignal(frame, signal, report);

		const first = names.get(signal.name);
		if (first === undefined) names.set(signal.name, s);
		else
			report(
				{
					severity: 'error',
					code: 'duplicate-signal-name',
					message: `frame "${frame.name}" already has a signal "${signal.name}" (signal ${first})`
				},
				'name'
			);

		if (signal.multiplexer && multiplexers[0] !== s) {
			report(
				{
					severity: 'error',
					code: 'multiple-multiplexers',
					message: `frame "${frame.name}" already has multiplexer "${frame.signals[multiplexers[0]].name}"; only one is allowed`
				},
				'multiplexer'
			);
		}
		if (signal.muxValue !== null) {
			if (multiplexers.length === 0) {
				report(
					{
						severity: 'error',
						code: 'mux-without-multiplexer',
						message: `"${signal.name}" has mux value ${signal.muxValue} but frame "${frame.name}" has no multiplexer signal, so it is never decoded`
					},
					'muxValue'
				);
			} else if (signal.multiplexer) {
				report(
					{
						severity: 'warning',
						code: 'nested-multiplexer',
						message: `"${signal.name}" is a multiplexer with a mux value: its bits are in every payload, but it is decoded only when the multiplexer carries ${signal.muxValue}`
					},
					'muxValue'
				);
			} else {
				const mux = frame.signals[multiplexers[0]];
				if (BigInt(signal.muxValue) > rawBounds({ ...mux, valueType: 'unsigned' }).hi) {
					report(
						{
							severity: 'warning',
							code: 'mux-value-out-of-range',
							message: `"${signal.name}" has mux value ${signal.muxValue}, which the ${mux.length}-bit multiplexer "${mux.name}" can never carry`
						},
						'muxValue'
					);
				}
			}
		}

		for (let other = 0; other < s; other++) {
			if (!presentTogether(frame.signals[other], signal)) continue;
			const shared = sets[other] & sets[s];
			if (shared !== 0n) {
				report(
					{
						severity: 'error',
						code: 'signal-overlap',
						message: `"${signal.name}" overlaps "${frame.signals[other].name}" on payload ${describeBits(shared)}`
					},
					'startBit'
				);
			}
		}
	});
}

export function lintMap(map: CanMap): LintProblem[] {
	const problems: LintProblem[] = [];
	const byId = new Map<string, number>();
	const byName = new Map<string, number>();
	const byPgn = new Map<number, number>();

	map.frames.forEach((frame, f) => {
		const report = (p: Omit<LintProblem, 'frameIndex' | 'signalIndex' | 'path'>, field?: string) =>
			problems.push({
				...p,
				frameIndex: f,
				signalIndex: null,
				path: field ? `${framePath(f)}.${field}` : framePath(f)
			});
		const idText = formatCanId(frame.id, frame.extended);

		if (!frame.extended && frame.id > MAX_STANDARD_ID) {
			report(
				{
					severity: 'error',
					code: 'standard-id-range',
					message: `frame "${frame.name}" has ID ${idText}, above the 11-bit maximum 0x7FF; mark it extended or fix the ID`
				},
				'id'
			);
		}
		if (frame.j1939 && !frame.extended) {
			report(
				{
					severity: 'error',
					code: 'j1939-standard-id',
					message: `frame "${frame.name}" is marked J1939 but has a standard ID; J1939 uses 29-bit extended IDs`
				},
				'j1939'
			);
		}

		const key = `${frame.extended ? 'x' : 's'}${frame.id}`;
		const sameId = byId.get(key);
		if (sameId === undefined) byId.set(key, f);
		else
			report(
				{
					severity: 'error',
					code: 'duplicate-frame-id',
					message: `frame "${frame.name}" has the same ${frame.extended ? 'extended' : 'standard'} ID ${idText} as frame "${map.frames[sameId].name}"`
				},
				'id'
			);

		if (frame.j1939 && frame.extended) {
			const pgn = j1939Pgn(frame.id);
			const samePgn = byPgn.get(pgn);
			if (samePgn === undefined) byPgn.set(pgn, f);
			else if (sameId === undefined) {
				report(
					{
						severity: 'error',
						code: 'duplicate-pgn',
						message: `J1939 frame "${frame.name}" has PGN ${pgn} like frame "${map.frames[samePgn].name}"; received frames match by PGN, so only the first is used`
					},
					'id'
				);
			}
		}

		const sameName = byName.get(frame.name);
		if (sameName === undefined) byName.set(frame.name, f);
		else
			report(
				{
					severity: 'error',
					code: 'duplicate-frame-name',
					message: `frame name "${frame.name}" is already used by frame ${sameName}`
				},
				'name'
			);

		lintFrameSignals(frame, f, problems);
	});
	// Alert rules are checked against the map by the alert module; their paths are made map-relative.
	for (const p of validateAlertRules(map.alertRules, map)) {
		problems.push({
			severity: p.severity,
			code: `alert-${p.code}`,
			message: p.message,
			frameIndex: null,
			signalIndex: null,
			path: `alertRules${p.path}`
		});
	}
	return problems;
}
