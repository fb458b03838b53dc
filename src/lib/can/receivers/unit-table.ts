/**
 * Our table of unit spellings: each unit string a map or a device may use, the quantity it
 * measures and the mathjs unit name that does the arithmetic (units.ts). Spellings in maps are
 * many ("°C", "degC", "C"; "km/h", "kph") and some clash with physics notation ("g" is standard
 * gravity here, not a gram), so the table, not mathjs's parser, decides what a string means.
 * Plain data and lookups, no mathjs: the browser validates profiles with it without loading mathjs.
 */
import { QUANTITY_LABELS, type Quantity } from './quantities';

interface UnitRow {
	quantity: Quantity;
	/** mathjs unit; null for units that only convert by our own rules (λ, AFR, %, counts). */
	math: string | null;
	/** How the unit is written when we write it. */
	symbol: string;
	spellings: readonly string[];
}

const row = (
	quantity: Quantity,
	math: string | null,
	symbol: string,
	...spellings: string[]
): UnitRow => ({ quantity, math, symbol, spellings: [symbol, ...spellings] });

const UNIT_ROWS: readonly UnitRow[] = [
	row('temperature', 'degC', '°C', 'degC', 'deg C', '℃', 'C'),
	row('temperature', 'degF', '°F', 'degF', 'deg F', '℉', 'F'),
	row('temperature', 'K', 'K'),
	row('pressure', 'kPa', 'kPa'),
	row('pressure', 'Pa', 'Pa'),
	row('pressure', 'hPa', 'hPa'),
	row('pressure', 'MPa', 'MPa'),
	row('pressure', 'bar', 'bar'),
	row('pressure', 'mbar', 'mbar'),
	row('pressure', 'psi', 'psi', 'lbf/in²'),
	row('pressure', 'inHg', 'inHg', '"Hg'),
	row('pressure', 'mmHg', 'mmHg'),
	row('pressure', 'atm', 'atm'),
	row('pressure', 'kgf/cm^2', 'kgf/cm²', 'kgf/cm2', 'kg/cm²', 'kg/cm2'),
	row('speed', 'km/h', 'km/h', 'kph', 'kmh', 'km/hr'),
	row('speed', 'mph', 'mph', 'mi/h'),
	row('speed', 'm/s', 'm/s'),
	row('speed', 'knot', 'kn', 'kt', 'knot', 'knots'),
	row('rotational-speed', 'rpm', 'rpm', 'r/min', 'rev/min', '1/min', 'min⁻¹'),
	row('rotational-speed', 'rps', 'rev/s', 'r/s', 'rps'),
	row('rotational-speed', 'rad/s', 'rad/s'),
	row('rotational-speed', 'deg/s', '°/s', 'deg/s'),
	row('angle', 'deg', '°', 'deg', 'degree', 'degrees'),
	row('angle', 'rad', 'rad'),
	row('acceleration', 'gn', 'g', 'gn'),
	row('acceleration', 'm/s^2', 'm/s²', 'm/s^2', 'm/s2'),
	row('voltage', 'V', 'V', 'volt', 'volts'),
	row('voltage', 'mV', 'mV'),
	row('voltage', 'kV', 'kV'),
	row('current', 'A', 'A', 'amp', 'amps'),
	row('current', 'mA', 'mA'),
	row('percent', null, '%', 'pct', 'percent'),
	row('ratio', null, 'ratio'),
	row('lambda', null, 'λ', 'lambda', 'lam'),
	row('equivalence-ratio', null, 'φ', 'ϕ', 'phi'),
	row('air-fuel-ratio', null, 'AFR', 'A/F', 'afr'),
	row('volume-flow', 'L/h', 'L/h', 'l/h', 'lph'),
	row('volume-flow', 'L/min', 'L/min', 'l/min', 'lpm'),
	row('volume-flow', 'mL/min', 'mL/min', 'ml/min', 'cc/min'),
	row('volume-flow', 'gal/h', 'gal/h', 'gph'),
	row('volume-flow', 'm^3/h', 'm³/h', 'm3/h'),
	row('mass-flow', 'g/s', 'g/s'),
	row('mass-flow', 'kg/h', 'kg/h'),
	row('mass-flow', 'lb/h', 'lb/h'),
	row('mass-flow', 'lb/min', 'lb/min'),
	row('volume', 'L', 'L', 'l', 'litre', 'liter', 'litres', 'liters'),
	row('volume', 'mL', 'mL', 'ml', 'cc'),
	row('volume', 'gal', 'gal'),
	row('distance', 'm', 'm'),
	row('distance', 'km', 'km'),
	row('distance', 'mm', 'mm'),
	row('distance', 'mi', 'mi', 'mile', 'miles'),
	row('distance', 'ft', 'ft'),
	row('time', 's', 's', 'sec'),
	row('time', 'ms', 'ms'),
	row('time', 'us', 'µs', 'μs', 'us'),
	row('time', 'min', 'min'),
	row('time', 'h', 'h', 'hr', 'hrs', 'hours'),
	row('frequency', 'Hz', 'Hz'),
	row('frequency', 'kHz', 'kHz'),
	row('power', 'W', 'W'),
	row('power', 'kW', 'kW'),
	row('power', 'hp', 'hp'),
	row('torque', 'N m', 'N·m', 'Nm', 'N m', 'N.m'),
	row('torque', 'lbf ft', 'lbf·ft', 'lb·ft', 'lbft', 'lb-ft', 'ft·lbf', 'ft-lb'),
	row('count', null, 'count', 'counts', 'cnt', '#')
];

/** Quantities that are shown without a unit: a unitless signal may stand for any of them. */
export const UNITLESS_QUANTITIES: readonly Quantity[] = ['ratio', 'count', 'state', 'other'];

export interface UnitInfo {
	/** As written by the caller. */
	text: string;
	quantity: Quantity;
	symbol: string;
	math: string | null;
}

const exact = new Map<string, UnitRow>();
const folded = new Map<string, UnitRow[]>();
for (const r of UNIT_ROWS) {
	for (const spelling of r.spellings) {
		if (exact.has(spelling)) throw new Error(`unit table: "${spelling}" is listed twice`);
		exact.set(spelling, r);
		const key = spelling.toLowerCase();
		folded.set(key, [...(folded.get(key) ?? []), r]);
	}
}

/**
 * The table row for a unit string: the exact spelling first, then ignoring case when that leaves
 * one unit ("KPA" is kPa, "rpm" and "RPM" are the same). A unit that two rows would claim
 * when case is ignored is not guessed.
 */
export function lookupUnit(text: string): UnitInfo | null {
	const trimmed = text.trim();
	const found = exact.get(trimmed) ?? singleOrNull(folded.get(trimmed.toLowerCase()));
	return found
		? { text: trimmed, quantity: found.quantity, symbol: found.symbol, math: found.math }
		: null;
}

function singleOrNull(rows: UnitRow[] | undefined): UnitRow | null {
	return rows && new Set(rows).size === 1 ? rows[0] : null;
}

/**
 * Quantities a unit string may measure: one for a known unit, the unitless ones for "", and
 * "other" for a string the table does not know (it only links to the very same string).
 */
export function quantitiesOfUnit(text: string): readonly Quantity[] {
	if (text.trim() === '') return UNITLESS_QUANTITIES;
	return [lookupUnit(text)?.quantity ?? 'other'];
}

/** Units a quantity may be shown in (their usual symbols), for messages and pickers. */
export function unitsOf(quantity: Quantity): string[] {
	const symbols = UNIT_ROWS.filter((r) => r.quantity === quantity).map((r) => r.symbol);
	return UNITLESS_QUANTITIES.includes(quantity) ? ['', ...symbols] : symbols;
}

/** Why `unit` cannot show `quantity`, or null when it can. "other" takes any unit. */
export function unitQuantityProblem(unit: string, quantity: Quantity): string | null {
	if (quantity === 'other' || quantitiesOfUnit(unit).includes(quantity)) return null;
	const known = lookupUnit(unit);
	const allowed = unitsOf(quantity)
		.map((u) => (u === '' ? 'no unit' : u))
		.join(', ');
	const what = unit.trim() === '' ? 'no unit' : `unit "${unit.trim()}"`;
	const measures = known
		? ` (it measures ${QUANTITY_LABELS[known.quantity]})`
		: unit.trim() === ''
			? ''
			: ' (not a unit Framewright knows)';
	return `${what} does not measure ${QUANTITY_LABELS[quantity]}${measures}; use one of ${allowed}`;
}

/** y = x × scale + offset. */
export interface Affine {
	scale: number;
	offset: number;
}

/**
 * Rounds away the last-digit noise of float arithmetic (33.8 − 32 = 1.7999999999999972 → 1.8) but
 * keeps factors such as 1/60 whole: only a 12-digit decimal within 1e-13 (relative) replaces x.
 */
export function tidyNumber(x: number): number {
	const short = Number(x.toPrecision(12));
	return Math.abs(short - x) <= Math.abs(x) * 1e-13 ? short : x;
}
