/** Small display formats shared by the capture views. */
import type { Dm1Lamps, Lamp } from '$lib/can/j1939';

/** Seconds with enough decimals to tell frames apart (µs) without trailing noise. */
export function formatSeconds(t: number): string {
	return Number.isFinite(t) ? t.toFixed(6).replace(/\.?0+$/, '') || '0' : '—';
}

export function formatNumber(v: number | null | undefined, digits = 4): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(digits)));
}

/** Source addresses and PGNs as people write them: decimal with the hex beside. */
export function formatAddress(sa: number): string {
	return `${sa} (0x${sa.toString(16).toUpperCase().padStart(2, '0')})`;
}

export function formatPgn(pgn: number): string {
	return `${pgn} (0x${pgn.toString(16).toUpperCase().padStart(4, '0')})`;
}

// The four DM1 lamps (SAE J1939-73, from memory), from the most significant bits of the status byte down.
const LAMP_NAMES: [keyof Dm1Lamps, string][] = [
	['malfunctionIndicator', 'Malfunction indicator'],
	['redStop', 'Red stop'],
	['amberWarning', 'Amber warning'],
	['protect', 'Protect']
];

function describeLamp(lamp: Lamp): string | null {
	if (lamp.state !== 'on') return null;
	return lamp.flash === 'slow' || lamp.flash === 'fast' ? `flashing ${lamp.flash}` : 'on';
}

/** The lamps a DM1 switched on, e.g. "Amber warning on, Red stop flashing fast"; "none" when all off. */
export function formatLamps(lamps: Dm1Lamps): string {
	const on = LAMP_NAMES.flatMap(([key, name]) => {
		const state = describeLamp(lamps[key]);
		return state ? [`${name} ${state}`] : [];
	});
	return on.length ? on.join(', ') : 'none';
}
