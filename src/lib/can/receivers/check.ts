/**
 * Checking a linked profile on a decoded capture, as an installer would before handing over:
 * does each channel arrive, as often as the map says, inside the range the device displays, and
 * does it move at all. Every finding is a sentence for a checklist.
 */
import type { CanMap } from '../map';
import { formatAlertNumber } from '../alerts/rule';
import type { CaptureCheck, ChannelCheck, CheckLine, CheckStatus } from './capture-check-schema';
import { channelOf, deviceChannels, type CaptureChannel } from './device-alerts';
import { channelText, findMapSignal, type Link } from './linking';
import type { ReceiverProfile, WantedChannel } from './profile';

export * from './capture-check-schema';

export interface CheckOptions {
	/** An update interval above cycle time × this is "slower than the map says" (default 1.5). */
	slowFactor?: number;
	/** A gap above cycle time × this is a dropout (default 5). */
	gapFactor?: number;
	/** Fewest samples and seconds before a constant value counts as stuck (defaults 10 and 2 s). */
	stuckSamples?: number;
	stuckSeconds?: number;
}

const RANK: Record<CheckStatus, number> = { pass: 0, warning: 1, fail: 2 };
const worst = (lines: readonly CheckLine[]): CheckStatus =>
	lines.reduce<CheckStatus>((w, l) => (RANK[l.status] > RANK[w] ? l.status : w), 'pass');

const ms = (seconds: number) => formatAlertNumber(Number((seconds * 1000).toPrecision(3)));

function valueText(wanted: WantedChannel, value: number): string {
	const unit = wanted.unit ? ` ${wanted.unit}` : '';
	return `${value.toFixed(wanted.decimals)}${unit}`;
}

function rangeText(wanted: WantedChannel): string {
	const unit = wanted.unit ? ` ${wanted.unit}` : '';
	const lo = wanted.min === null ? '…' : String(wanted.min);
	const hi = wanted.max === null ? '…' : String(wanted.max);
	return `${lo}…${hi}${unit}`.replace('……', '…');
}

function median(sorted: Float64Array): number {
	const mid = sorted.length >> 1;
	return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Present samples (NaN = absent) of a channel: times and device values. */
function present(time: Float64Array, value: Float64Array) {
	const t: number[] = [];
	const v: number[] = [];
	for (let i = 0; i < value.length; i++) {
		if (!Number.isNaN(value[i])) {
			t.push(time[i]);
			v.push(value[i]);
		}
	}
	return { t, v };
}

export function checkOnCapture(
	profile: ReceiverProfile,
	map: CanMap,
	links: readonly Link[],
	channels: readonly CaptureChannel[],
	options: CheckOptions = {}
): CaptureCheck {
	const slowFactor = options.slowFactor ?? 1.5;
	const gapFactor = options.gapFactor ?? 5;
	const stuckSamples = options.stuckSamples ?? 10;
	const stuckSeconds = options.stuckSeconds ?? 2;
	const device = deviceChannels(profile, links, channels);

	const results = profile.wanted.map((wanted, index): ChannelCheck => {
		const lines: CheckLine[] = [];
		const result = (extra: Partial<ChannelCheck> = {}): ChannelCheck => ({
			wanted: wanted.name,
			required: wanted.required,
			status: worst(lines),
			lines,
			samples: 0,
			medianIntervalMs: null,
			maxGapMs: null,
			outsideShare: null,
			...extra
		});
		const link = links.find((l) => l.wanted.toLowerCase() === wanted.name.toLowerCase());
		if (!link) {
			lines.push({
				check: 'link',
				status: wanted.required ? 'fail' : 'warning',
				sentence: `${wanted.name} is not linked — the device gets nothing for it${wanted.required ? ', and it is required' : ''}; link it to a signal first`
			});
			return result();
		}
		const where = channelText(link.frame, link.signal);
		const found = findMapSignal(map, link);
		if (!found) {
			lines.push({
				check: 'link',
				status: 'fail',
				sentence: `${wanted.name} is linked to ${where}, which this map revision does not have; relink it`
			});
			return result();
		}

		const source = channelOf(channels, link);
		const converted = device.find((c) => c.info.index === index);
		const { t, v } = converted
			? present(converted.time, converted.value)
			: { t: [] as number[], v: [] as number[] };
		if (v.length === 0) {
			const frameArrives = channels.some(
				(c) => c.info.frameName === link.frame && c.value.some((x) => !Number.isNaN(x))
			);
			lines.push({
				check: 'samples',
				status: 'fail',
				sentence: frameArrives
					? `no samples for ${wanted.name} — frame ${link.frame} arrives but ${link.signal} is never in it (another multiplexer page, a shorter payload or a "not available" value); check the controller's output settings`
					: `no samples for ${wanted.name} — the controller sends nothing for it in this recording (no ${link.frame} frames${source ? '' : ' decoded'}); check the sensor input and that the controller broadcasts ${link.frame}`
			});
			return result();
		}
		lines.push({
			check: 'samples',
			status: 'pass',
			sentence: `${wanted.name} arrives: ${v.length} samples from ${where}`
		});

		// Update interval against the frame's cycle time.
		let medianIntervalMs: number | null = null;
		let maxGapMs: number | null = null;
		if (t.length >= 2) {
			const gaps = new Float64Array(t.length - 1);
			for (let i = 1; i < t.length; i++) gaps[i - 1] = t[i] - t[i - 1];
			gaps.sort();
			const typical = median(gaps);
			const longest = gaps[gaps.length - 1];
			medianIntervalMs = typical * 1000;
			maxGapMs = longest * 1000;
			const cycle = found.frame.cycleMs;
			if (cycle === null)
				lines.push({
					check: 'interval',
					status: 'pass',
					sentence: `${wanted.name} updates about every ${ms(typical)} ms (the map gives ${link.frame} no cycle time to compare)`
				});
			else if (medianIntervalMs > cycle * slowFactor)
				lines.push({
					check: 'interval',
					status: 'warning',
					sentence: `${wanted.name} updates about every ${ms(typical)} ms, slower than the ${cycle} ms cycle time the map gives ${link.frame} — the frame is sent less often or partly lost; check the controller's broadcast rate and the bus load`
				});
			else if (maxGapMs > cycle * gapFactor)
				lines.push({
					check: 'interval',
					status: 'warning',
					sentence: `${wanted.name} updates every ${ms(typical)} ms as expected, but once went ${ms(longest)} ms without a sample — dropouts; check wiring, termination and bus errors`
				});
			else
				lines.push({
					check: 'interval',
					status: 'pass',
					sentence: `${wanted.name} updates about every ${ms(typical)} ms, matching the ${cycle} ms cycle time of ${link.frame}`
				});
		}

		// Share outside the display range, in the device's unit.
		let lo = Infinity;
		let hi = -Infinity;
		let outside = 0;
		for (const x of v) {
			if (x < lo) lo = x;
			if (x > hi) hi = x;
			if ((wanted.min !== null && x < wanted.min) || (wanted.max !== null && x > wanted.max))
				outside++;
		}
		let outsideShare: number | null = null;
		if (wanted.min !== null || wanted.max !== null) {
			outsideShare = outside / v.length;
			const span = `lowest ${valueText(wanted, lo)}, highest ${valueText(wanted, hi)}`;
			lines.push(
				outside === 0
					? {
							check: 'range',
							status: 'pass',
							sentence: `every ${wanted.name} sample lies within the display range ${rangeText(wanted)} (${span})`
						}
					: {
							check: 'range',
							status: 'warning',
							sentence: `${formatAlertNumber(Number((outsideShare * 100).toPrecision(3)))} % of ${wanted.name} samples lie outside the display range ${rangeText(wanted)} (${span}) — the device will sit at its end stop; widen the range or check the sensor and the conversion`
						}
			);
		}

		// A value that never moves: a stuck sensor, a disconnected input or a held default.
		const seconds = t[t.length - 1] - t[0];
		if (v.length >= stuckSamples && seconds >= stuckSeconds && lo === hi) {
			const expected = wanted.quantity === 'state' || wanted.quantity === 'count';
			lines.push({
				check: 'stuck',
				status: expected ? 'pass' : 'warning',
				sentence: expected
					? `${wanted.name} holds ${valueText(wanted, lo)} throughout (${formatAlertNumber(Number(seconds.toPrecision(3)))} s), which may be right for a state or count`
					: `${wanted.name} shows ${valueText(wanted, lo)} throughout (${v.length} samples over ${formatAlertNumber(Number(seconds.toPrecision(3)))} s) — a stuck or disconnected sensor, or a value the controller holds; check it moves when it should`
			});
		}
		return result({ samples: v.length, medianIntervalMs, maxGapMs, outsideShare });
	});

	const counts = { pass: 0, warning: 0, fail: 0 };
	for (const r of results) counts[r.status]++;
	return { channels: results, counts };
}
