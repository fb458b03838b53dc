/**
 * What a wanted channel measures (its quantity) and the fuels an air–fuel ratio can refer to.
 * The list is closed on purpose: a quantity decides which units a channel may be shown in and
 * which signals it can be linked to (docs/receivers.md).
 */
import { z } from 'zod';

export const QUANTITIES = [
	'temperature',
	'pressure',
	'speed',
	'rotational-speed',
	'angle',
	'acceleration',
	'voltage',
	'current',
	'percent',
	'ratio',
	'lambda',
	'equivalence-ratio',
	'air-fuel-ratio',
	'volume-flow',
	'mass-flow',
	'volume',
	'distance',
	'time',
	'frequency',
	'power',
	'torque',
	'count',
	'state',
	'other'
] as const;

export const quantitySchema = z.enum(QUANTITIES, {
	error: `quantity must be one of ${QUANTITIES.join(', ')}`
});
export type Quantity = z.infer<typeof quantitySchema>;

/** How a quantity is shown to people. */
export const QUANTITY_LABELS: Record<Quantity, string> = {
	temperature: 'temperature',
	pressure: 'pressure',
	speed: 'speed',
	'rotational-speed': 'rotational speed',
	angle: 'angle',
	acceleration: 'acceleration',
	voltage: 'voltage',
	current: 'current',
	percent: 'percent',
	ratio: 'ratio',
	lambda: 'lambda (λ)',
	'equivalence-ratio': 'equivalence ratio (φ)',
	'air-fuel-ratio': 'air–fuel ratio',
	'volume-flow': 'volume flow',
	'mass-flow': 'mass flow',
	volume: 'volume',
	distance: 'distance',
	time: 'time',
	frequency: 'frequency',
	power: 'power',
	torque: 'torque',
	count: 'count',
	state: 'state (on/off or an enumeration)',
	other: 'other'
};

/**
 * The mixture quantities convert into each other by trade rules rather than physics:
 * φ = 1/λ and AFR = λ × the fuel's stoichiometric AFR (conversion.ts).
 */
export const MIXTURE_QUANTITIES = ['lambda', 'equivalence-ratio', 'air-fuel-ratio'] as const;
export type MixtureQuantity = (typeof MIXTURE_QUANTITIES)[number];

export function isMixture(quantity: Quantity): quantity is MixtureQuantity {
	return (MIXTURE_QUANTITIES as readonly string[]).includes(quantity);
}

/**
 * Stoichiometric air–fuel ratios by mass, common practice (from memory): the figures tuners and
 * display makers use; real fuels vary with blend and season, so a device should let people adjust.
 */
export const FUELS = {
	gasoline: { label: 'gasoline', stoichiometricAfr: 14.7 },
	e85: { label: 'E85', stoichiometricAfr: 9.8 },
	ethanol: { label: 'ethanol', stoichiometricAfr: 9.0 },
	methanol: { label: 'methanol', stoichiometricAfr: 6.4 },
	diesel: { label: 'diesel', stoichiometricAfr: 14.5 },
	lpg: { label: 'LPG', stoichiometricAfr: 15.5 },
	cng: { label: 'CNG', stoichiometricAfr: 17.2 }
} as const;
export type Fuel = keyof typeof FUELS;
export const FUEL_IDS = Object.keys(FUELS) as [Fuel, ...Fuel[]];

export const fuelSchema = z.enum(FUEL_IDS, {
	error: `fuel must be one of ${FUEL_IDS.join(', ')}`
});
