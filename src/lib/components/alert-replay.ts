/** Pure helpers of the replayed alert events list (AlertReplayEvents.svelte). */
import type { ReplayedEvent } from '$lib/can/alerts/replay';

/** A stable key of an event across replays with other acknowledgements: its rule and start. */
export function eventKey(event: Pick<ReplayedEvent, 'rule' | 'start'>): string {
	return `${event.rule}@${event.start}`;
}

/** "3 events from 2 rules, with 1 acknowledgement replayed." — the line above the events. */
export function replayStatus(
	counts: { events: number; rules: number; acknowledgements: number },
	eventNoun: string
): string {
	const plural = (n: number, noun: string) => `${n} ${noun}${n === 1 ? '' : 's'}`;
	const acks = counts.acknowledgements
		? `, with ${plural(counts.acknowledgements, 'acknowledgement')} replayed`
		: '';
	return `${plural(counts.events, eventNoun)} from ${plural(counts.rules, 'rule')}${acks}.`;
}
