/**
 * Making a link's conversion from the signal's unit to the unit the device shows (the stored
 * shape and its arithmetic are scaling.ts, re-exported here). Physical units convert through mathjs (units.ts). The mixture measures convert by trade rules,
 * common practice: λ = actual AFR ÷ stoichiometric AFR of the fuel, and the equivalence ratio
 * φ = 1/λ. 1/x is not affine, so a link involving φ on one side only is "reciprocal": a receive
 * set marks it and a device must do the division itself (docs/receivers.md).
 */
import {
	FUELS,
	isMixture,
	QUANTITY_LABELS,
	type Fuel,
	type MixtureQuantity,
	type Quantity
} from './quantities';
import type { Conversion } from './scaling';
import { lookupUnit, quantitiesOfUnit, unitAffine, UNITLESS_QUANTITIES } from './units';

export * from './scaling';

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
