/**
 * The capture page's bus picker (docs/capture-csv.md, "Several buses"): "All buses" or one bus of
 * a capture with a bus column; per-ID statistics, unknown IDs and bus load follow the choice.
 */

/** A bus as people read it: its name from the file, or its number when the file named none. */
export function busLabel(buses: readonly string[], bus: number): string {
	const name = buses[bus];
	return name === undefined || name === '' ? `bus ${bus + 1}` : name;
}

/** The entries of a per-bus list on the picked bus (all of them for "All buses"). */
export function onBus<T extends { bus?: number }>(entries: readonly T[], bus: number | null): T[] {
	return bus === null ? [...entries] : entries.filter((e) => (e.bus ?? 0) === bus);
}

/**
 * IDs carried by more than one bus (as `bus:id:extended` keys of the IDs): an all-bus decode mixes
 * their frames into one channel, so the page says which and offers one bus at a time.
 */
export function idsOnSeveralBuses(
	ids: readonly { bus?: number; id: number; extended: boolean }[]
): { id: number; extended: boolean; buses: number[] }[] {
	const seen = new Map<string, { id: number; extended: boolean; buses: number[] }>();
	for (const s of ids) {
		const key = `${s.extended ? 'x' : 's'}${s.id}`;
		const entry = seen.get(key) ?? { id: s.id, extended: s.extended, buses: [] };
		entry.buses.push(s.bus ?? 0);
		seen.set(key, entry);
	}
	return [...seen.values()].filter((e) => e.buses.length > 1);
}
