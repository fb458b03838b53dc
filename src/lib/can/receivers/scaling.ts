/**
 * A link's conversion as stored (its zod schema) and the arithmetic on it that needs no units
 * library: applying it, composing it with a signal's own scale and offset, and its text for
 * people. Free of mathjs, so the browser shows links and composed scalings without loading it;
 * making a conversion between two units is conversion.ts.
 *   linear:      device = (raw × s + o) × a + b = raw × (s·a) + (o·a + b)
 *   reciprocal:  device = k / (raw × s + o)     = 1 / (raw × s/k + o/k)
 */
import { z } from 'zod';
import { FUELS, fuelSchema } from './quantities';
import { tidyNumber } from './unit-table';

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

/** The device value for a physical value of the signal. */
export function applyConversion(conversion: Conversion, x: number): number {
	return conversion.form === 'linear'
		? x * conversion.scale + conversion.offset
		: conversion.scale / x;
}

/** A signal's scale/offset composed with a conversion: how a device turns raw into its value. */
export const composedScalingSchema = z.object({
	/** linear: value = raw × scale + offset; reciprocal: value = 1 / (raw × scale + offset). */
	form: conversionFormSchema,
	scale: z.number(),
	offset: z.number()
});
export type ComposedScaling = z.infer<typeof composedScalingSchema>;

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
