/**
 * Wall-clock times of a capture (docs/capture-csv.md, "Wall-clock times"). Frame times are kept as
 * seconds from the first frame; the capture's **origin** says how the file wrote time and what its
 * first frame's absolute time was, so views can show `14:03:07.250` (time of day) or
 * `2026-03-04 14:03:07.250 UTC` (date-times and epoch numbers) instead of `50527.25 s`.
 * A time of day that passed midnight counts on from 24:00 in the file's terms; it is shown as the
 * clock reads, with the day after the first marked `+1 d`.
 */
import { z } from 'zod';

export const captureOriginSchema = z.object({
	/**
	 * `relative`: times are seconds from some start (nothing to show but seconds);
	 * `time-of-day`: `seconds` since midnight of the first frame; `date-time` / `epoch`: `seconds`
	 * since 1970-01-01T00:00:00Z (ISO 8601 date-times, Unix-time numbers).
	 */
	kind: z.enum(['relative', 'time-of-day', 'date-time', 'epoch']),
	seconds: z.number()
});
export type CaptureOrigin = z.infer<typeof captureOriginSchema>;

const DAY = 86_400;
const pad = (n: number, width = 2) => String(n).padStart(width, '0');

/** The origin of a capture read with a layout whose time is `timeFormat` (epoch numbers flagged). */
export function originOf(
	timeFormat: 'number' | 'time-of-day' | 'date-time',
	epochTime: boolean,
	timeOrigin: number | null
): CaptureOrigin {
	const seconds = timeOrigin ?? 0;
	if (timeFormat === 'time-of-day') return { kind: 'time-of-day', seconds };
	if (timeFormat === 'date-time') return { kind: 'date-time', seconds };
	return { kind: epochTime ? 'epoch' : 'relative', seconds };
}

/** Whether the capture's times can be shown as a clock reading. */
export const hasClock = (origin: CaptureOrigin) => origin.kind !== 'relative';

/** `whole` seconds and a fraction rounded to `digits`, carried into the whole seconds if it rounds up. */
function split(seconds: number, digits: number): { whole: number; fraction: string } {
	let whole = Math.floor(seconds);
	const scale = 10 ** digits;
	let units = Math.round((seconds - whole) * scale);
	if (units >= scale) {
		whole += 1;
		units -= scale;
	}
	return { whole, fraction: digits > 0 ? `.${pad(units, digits)}` : '' };
}

function clockText(secondsOfDay: number, fraction: string): string {
	const h = Math.floor(secondsOfDay / 3600);
	const m = Math.floor((secondsOfDay % 3600) / 60);
	const s = secondsOfDay % 60;
	return `${pad(h)}:${pad(m)}:${pad(s)}${fraction}`;
}

export interface ClockOptions {
	/** Digits after the second (3 = ms, 6 = µs). */
	digits?: number;
	/** Leave out the date of date-time captures (axes, where the date is said once). */
	timeOnly?: boolean;
}

/**
 * Frame time `t` (seconds from the first frame) as the clock read it: `hh:mm:ss.fff` for a time of
 * day (`+1 d` after midnight), `YYYY-MM-DD hh:mm:ss.fff UTC` for date-times; null for a capture
 * with relative times (show seconds).
 */
export function formatClock(
	origin: CaptureOrigin,
	t: number,
	options: ClockOptions = {}
): string | null {
	if (!hasClock(origin) || !Number.isFinite(t)) return null;
	const { whole, fraction } = split(origin.seconds + t, options.digits ?? 3);
	if (origin.kind === 'time-of-day') {
		const day = Math.floor(whole / DAY);
		const text = clockText(whole - day * DAY, fraction);
		return day === 0 ? text : `${text} ${day > 0 ? '+' : ''}${day} d`;
	}
	const date = new Date(whole * 1000);
	const time = clockText(
		date.getUTCHours() * 3600 + date.getUTCMinutes() * 60 + date.getUTCSeconds(),
		fraction
	);
	if (options.timeOnly) return time;
	const day = `${pad(date.getUTCFullYear(), 4)}-${pad(date.getUTCMonth() + 1)}-${pad(date.getUTCDate())}`;
	return `${day} ${time} UTC`;
}

/** Frame time `t` as an ISO 8601 text for exports (`2026-03-04T14:03:07.250000Z`, or `14:03:07.250000` for a time of day). */
export function isoClock(origin: CaptureOrigin, t: number): string {
	if (!hasClock(origin)) return '';
	if (origin.kind === 'time-of-day') return formatClock(origin, t, { digits: 6 }) ?? '';
	const text = formatClock(origin, t, { digits: 6 })!;
	return `${text.slice(0, 10)}T${text.slice(11, -4)}Z`;
}

/** Name of the column exports add for a capture with a clock. */
export const CLOCK_COLUMN = 'clock';

/**
 * A CSV export (its text in pieces cut anywhere) with a `clock` column added to every record: the
 * first field (time in seconds from the first frame) read as the capture's clock, ISO 8601. Quoted
 * fields may hold line breaks (RFC 4180): a record ends at a line break outside quotes.
 */
export async function* withClockColumn(
	pieces: AsyncIterable<string>,
	origin: CaptureOrigin
): AsyncGenerator<string> {
	let carry = '';
	let header = true;
	let inQuotes = false;
	let record = '';
	const finishRecord = (text: string): string => {
		if (header) {
			header = false;
			return `${text},${CLOCK_COLUMN}`;
		}
		const comma = text.indexOf(',');
		const t = Number(comma < 0 ? text : text.slice(0, comma));
		return `${text},${Number.isFinite(t) ? isoClock(origin, t) : ''}`;
	};
	const lines = (text: string, final: boolean): string => {
		let out = '';
		let start = 0;
		for (;;) {
			const end = text.indexOf('\n', start);
			if (end < 0) break;
			const line = text.slice(start, end);
			start = end + 1;
			for (let i = line.indexOf('"'); i >= 0; i = line.indexOf('"', i + 1)) inQuotes = !inQuotes;
			record += line;
			if (inQuotes) {
				record += '\n';
				continue;
			}
			out += record === '' ? '\n' : `${finishRecord(record)}\n`;
			record = '';
		}
		carry = text.slice(start);
		if (final && (carry !== '' || record !== '')) {
			out += finishRecord(record + carry);
			carry = '';
		}
		return out;
	};
	for await (const piece of pieces) {
		const out = lines(carry + piece, false);
		if (out) yield out;
	}
	const rest = lines(carry, true);
	if (rest) yield rest;
}
