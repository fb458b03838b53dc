/**
 * How views treat a signal's role (docs/map-format.md, "Signal roles"): a counter or checksum is
 * marked with a text badge, and is never what a view picks on its own (a default plot, an example
 * formula, a new alert rule), since its raw value moves without meaning anything physical.
 */
import type { SignalRole } from './can/map';

/** The badge text beside a signal, null for a value (which needs none). */
export const ROLE_BADGE: Record<SignalRole, string | null> = {
	value: null,
	counter: 'counter',
	checksum: 'checksum'
};

/** What the badge says to a screen reader and in a tooltip. */
export const ROLE_HINT: Record<SignalRole, string> = {
	value: 'a measured or set value',
	counter: 'a rolling counter: its raw value steps each frame and means nothing physical',
	checksum: 'a checksum over the frame: its raw value means nothing physical'
};

/** A value (absent counts as value: derived channels, decodes stored before roles). */
export const isValueRole = (role: SignalRole | undefined): boolean =>
	role === undefined || role === 'value';

/** The entries a view may choose by default: values only, in their order. */
export function valueChannels<T extends { role?: SignalRole }>(channels: readonly T[]): T[] {
	return channels.filter((c) => isValueRole(c.role));
}
