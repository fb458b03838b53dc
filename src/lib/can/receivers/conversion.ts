/**
 * A link's conversion from the signal's unit to the unit the device shows, and its composition
 * with the signal's own scale and offset:
 *   linear:      device = (raw × s + o) × a + b = raw × (s·a) + (o·a + b)
 *   reciprocal:  device = k / (raw × s + o)     = 1 / (raw × s/k + o/k)
 * Physical units convert through mathjs (units.ts). The mixture measures convert by trade rules,
 * common practice: λ = actual AFR ÷ stoichiometric AFR of the fuel, and the equivalence ratio
 * φ = 1/λ. 1/x is not affine, so a link involving φ on one side only is "reciprocal": a receive
 * set marks it and a device must do the division itself (docs/receivers.md).
 */
import { z } from 'zod';
import {
	FUELS,
	fuelSchema,
	isMixture,
	QUANTITY_LABELS,
	type Fuel,
	type MixtureQuantity,
	type Quantity
} from './quantities';
import { lookupUnit, quantitiesOfUnit, tidyNumber, unitAffine, UNITLESS_QUANTITIES } from './units';

export const conversionFormSchema = z.enum(['linear', 'reciprocal']);
export type ConversionForm = z.infer<typeof conversionFormSchema>;

const finite = (what: string) => z.number({ error: `${what} must be a finite number` });

export const conversionSchema = z
	.strictObject({
		kind: z
			.enum(['identity', 'units', 'mixture'])
			.describe('identity: none; units: physical units (mathjs); mixture: λ / φ / AFR rules'),
		from: z.string().max(40).describe("the signal's unit, as the map writes it"),
		to: z.string().max(40).describe('the unit the device shows'),
		form: conversionFormSchema.describe(
			'linear: y = x × scale + offset; reciprocal: y = scale / x (offset 0)'
		),
		scale: finite('scale'),
		offset: finite('offset'),
		fuel: fuelSchema
			.nullable()
			.default(null)
			.describe('the fuel whose stoichiometric AFR the conversion uses')
	})
	.refine((c) => c.form === 'linear' || c.offset === 0, {
		message: 'a reciprocal conversion has offset 0',
		path: ['offset']
	})
	.refine((c) => c.form === 'linear' || c.scale !== 0, {
		message: 'a reciprocal conversion needs a scale other than 0',
		path: ['scale']
	});
export type Conversion = z.output<typeof conversionSchema>;

export type ConversionResult =
	{ ok: true; conversion: Conversion } | { ok: false; message: string };

/** One side of a conversion: a unit and, when the unit alone does not say it, the quantity. */
export interface UnitSide {
	unit: string;
	quantity?: Quantity;
}

const IDENTITY_BASE = { form: 'linear', scale: 1, offset: 0, fuel: null } as const;

function identity(from: string, to: string): Conversion {
	return { kind: 'identity', from, to, ...IDENTITY_BASE };
}

/** The quantity a side measures: given, or read from its unit (a unitless side takes the other's). */
function quantityOf(side: UnitSide, other: Quantity | undefined): Quantity {
	if (side.quantity) return side.quantity;
	const possible = quantitiesOfUnit(side.unit);
	return other && possible.includes(other) ? other : possible[0];
}

const describeUnit = (unit: string) => (unit.trim() === '' ? 'no unit' : `"${unit.trim()}"`);

/**
 * The conversion from a signal's unit to a device's unit, or why there is none. `fuel` is needed
 * when exactly one side is an air–fuel ratio.
 */
export function makeConversion(
	from: UnitSide,
	to: UnitSide,
	fuel: Fuel | null = null
): ConversionResult {
	const toQuantity = quantityOf(to, from.quantity);
	const fromQuantity = quantityOf(from, toQuantity);
	const fromUnit = from.unit.trim();
	const toUnit = to.unit.trim();
	const problem = (message: string): ConversionResult => ({ ok: false, message });

	if (isMixture(fromQuantity) && isMixture(toQuantity))
		return mixtureConversion(fromQuantity, toQuantity, fromUnit, toUnit, fuel);
	// "other" promises nothing about the unit, so only the very same unit text links to it.
	if (fromQuantity === 'other' || toQuantity === 'other')
		return fromUnit === toUnit
			? { ok: true, conversion: identity(fromUnit, toUnit) }
			: problem(
					`${describeUnit(fromUnit)} and ${describeUnit(toUnit)} differ and one of them is not a unit Framewright can convert`
				);
	if (fromQuantity !== toQuantity)
		return problem(
			`${describeUnit(fromUnit)} measures ${QUANTITY_LABELS[fromQuantity]} and ${describeUnit(toUnit)} measures ${QUANTITY_LABELS[toQuantity]}; they do not convert`
		);
	if (fromUnit === toUnit) return { ok: true, conversion: identity(fromUnit, toUnit) };
	const a = lookupUnit(fromUnit);
	const b = lookupUnit(toUnit);
	// A unitless quantity (count, ratio, state) written as "" or as its own word ("count") is one unit.
	const bare = (info: typeof a, text: string) => text === '' || info?.quantity === toQuantity;
	if (UNITLESS_QUANTITIES.includes(toQuantity) && bare(a, fromUnit) && bare(b, toUnit))
		return { ok: true, conversion: identity(fromUnit, toUnit) };
	if (!a || !b)
		return problem(
			`${describeUnit(fromUnit)} and ${describeUnit(toUnit)} differ and ${describeUnit(a ? toUnit : fromUnit)} is not a unit Framewright can convert`
		);
	try {
		const { scale, offset } = unitAffine(a, b);
		if (scale === 1 && offset === 0) return { ok: true, conversion: identity(fromUnit, toUnit) };
		return {
			ok: true,
			conversion: {
				kind: 'units',
				from: fromUnit,
				to: toUnit,
				form: 'linear',
				scale,
				offset,
				fuel: null
			}
		};
	} catch (error) {
		return problem((error as Error).message);
	}
}

const MIXTURE_SYMBOL: Record<MixtureQuantity, string> = {
	lambda: 'λ',
	'equivalence-ratio': 'φ',
	'air-fuel-ratio': 'AFR'
};

function mixtureConversion(
	from: MixtureQuantity,
	to: MixtureQuantity,
	fromUnit: string,
	toUnit: string,
	fuel: Fuel | null
): ConversionResult {
	if (from === to) return { ok: true, conversion: identity(fromUnit, toUnit) };
	const needsFuel = from === 'air-fuel-ratio' || to === 'air-fuel-ratio';
	if (needsFuel && fuel === null)
		return {
			ok: false,
			message: `converting ${MIXTURE_SYMBOL[from]} to ${MIXTURE_SYMBOL[to]} needs a fuel for its stoichiometric air–fuel ratio (${Object.entries(
				FUELS
			)
				.map(([id, f]) => `${id} ${f.stoichiometricAfr}`)
				.join(', ')})`
		};
	const st = needsFuel && fuel ? FUELS[fuel].stoichiometricAfr : 1;
	const base = {
		kind: 'mixture' as const,
		from: fromUnit,
		to: toUnit,
		fuel: needsFuel ? fuel : null
	};
	// Through λ: AFR = st·λ, φ = 1/λ. Any path through φ on one side only is a division.
	if (from === 'lambda' && to === 'air-fuel-ratio')
		return { ok: true, conversion: { ...base, form: 'linear', scale: st, offset: 0 } };
	if (from === 'air-fuel-ratio' && to === 'lambda')
		return { ok: true, conversion: { ...base, form: 'linear', scale: 1 / st, offset: 0 } };
	// λ ↔ φ: 1/x; AFR ↔ φ: st/x (φ = st/AFR and AFR = st/φ).
	return { ok: true, conversion: { ...base, form: 'reciprocal', scale: st, offset: 0 } };
}

/** The device value for a physical value of the signal. */
export function applyConversion(conversion: Conversion, x: number): number {
	return conversion.form === 'linear'
		? x * conversion.scale + conversion.offset
		: conversion.scale / x;
}

/** A signal's scale/offset composed with a conversion: how a device turns raw into its value. */
export interface ComposedScaling {
	/** linear: value = raw × scale + offset; reciprocal: value = 1 / (raw × scale + offset). */
	form: ConversionForm;
	scale: number;
	offset: number;
}

export function composeScaling(
	signal: { scale: number; offset: number },
	conversion: Conversion
): ComposedScaling {
	// tidyNumber: a setup sheet should say −459.4, not −459.40000000000003.
	if (conversion.form === 'linear')
		return {
			form: 'linear',
			scale: tidyNumber(signal.scale * conversion.scale),
			offset: tidyNumber(signal.offset * conversion.scale + conversion.offset)
		};
	return {
		form: 'reciprocal',
		scale: tidyNumber(signal.scale / conversion.scale),
		offset: tidyNumber(signal.offset / conversion.scale)
	};
}

/** The value a device shows for a raw field value under composed scaling. */
export function scaledValue(scaling: ComposedScaling, raw: number): number {
	const linear = raw * scaling.scale + scaling.offset;
	return scaling.form === 'linear' ? linear : 1 / linear;
}

/** Compact number text for people: up to 6 significant digits, no trailing zeros. */
export function formatFactor(value: number): string {
	return String(Number.parseFloat(value.toPrecision(6)));
}

const shown = (unit: string) => (unit === '' ? '(no unit)' : unit);

/** One line for people: "°F → °C: × 0.555556 − 17.7778". */
export function describeConversion(conversion: Conversion): string {
	const arrow = `${shown(conversion.from)} → ${shown(conversion.to)}`;
	if (conversion.kind === 'identity') return `${arrow}: no conversion`;
	const fuel = conversion.fuel
		? ` (${FUELS[conversion.fuel].label}, stoichiometric AFR ${FUELS[conversion.fuel].stoichiometricAfr}, common practice)`
		: '';
	if (conversion.form === 'reciprocal')
		return `${arrow}${fuel}: ${formatFactor(conversion.scale)} ÷ value — not linear, the device must divide (needs device-side inversion)`;
	const offset =
		conversion.offset === 0
			? ''
			: ` ${conversion.offset < 0 ? '−' : '+'} ${formatFactor(Math.abs(conversion.offset))}`;
	return `${arrow}${fuel}: × ${formatFactor(conversion.scale)}${offset}`;
}
