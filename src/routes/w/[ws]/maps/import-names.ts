/** Names for an imported map when one of that name exists already. */

/** Names compare as people read them: case and surrounding spaces do not make two maps different. */
export const sameName = (a: string, b: string) =>
	a.trim().toLocaleLowerCase('en') === b.trim().toLocaleLowerCase('en');

/** `Name (copy)`, then `Name (copy 2)`, … — the first one no existing map uses. */
export function copyName(name: string, taken: readonly string[]): string {
	const base = name.trim();
	for (let n = 1; ; n++) {
		const candidate = `${base} (copy${n === 1 ? '' : ` ${n}`})`;
		if (!taken.some((t) => sameName(t, candidate))) return candidate;
	}
}
