/** Pure helpers of the alert events list: plot markers, timeline spans and acknowledgement input. */
import type { AlertReplay, ReplayedEvent } from '$lib/can/alerts/replay';
import { SEVERITY_LABELS } from '$lib/can/alerts/rule';
import type { PlotMarker } from './plot-range';

/** One shaded span per event on the channel plot; an open event runs to the end of the recording. */
export function alertMarkers(events: readonly ReplayedEvent[]): PlotMarker[] {
	return events.map((e) => ({
		time: e.start,
		endTime: e.end,
		label: `${e.ruleName} (${SEVERITY_LABELS[e.severity]})`,
		severity: e.severity
	}));
}

/** Where an event sits on a 0–100 % timeline of the recording (at least a sliver, so short events show). */
export function timelineSpan(
	event: Pick<ReplayedEvent, 'start' | 'end'>,
	endTime: number
): { left: number; width: number } {
	const total = endTime > 0 ? endTime : 1;
	const left = Math.min(100, Math.max(0, (event.start / total) * 100));
	const right = Math.min(100, Math.max(left, ((event.end ?? endTime) / total) * 100));
	return { left, width: Math.max(right - left, 0.5) };
}

export { eventKey } from '$lib/components/alert-replay';

/** Reads an acknowledgement time typed by a person: seconds from the capture start, within the event. */
export function parseAckTime(
	text: string,
	event: Pick<ReplayedEvent, 'start'>,
	replay: Pick<AlertReplay, 'endTime'>
): number | string {
	const trimmed = text.trim().replace(',', '.');
	if (trimmed === '') return 'enter the time of the acknowledgement in seconds';
	const t = Number(trimmed);
	if (!Number.isFinite(t)) return `"${text.trim()}" is not a number of seconds`;
	if (t < event.start)
		return `the event starts at ${event.start.toFixed(3)} s; acknowledge at or after that`;
	if (t > replay.endTime) return `the recording ends at ${replay.endTime.toFixed(3)} s`;
	return t;
}
