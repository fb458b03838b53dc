/**
 * Unit arithmetic through mathjs: the factor and offset between two units of the unit table
 * (unit-table.ts, which says what each spelling means). The only module of the receivers library
 * that loads mathjs, so pages that only validate or show profiles stay without it.
 */
import { create, createUnitDependencies, unitDependencies } from 'mathjs';
import { QUANTITY_LABELS } from './quantities';
import { tidyNumber, type Affine, type UnitInfo } from './unit-table';

export * from './unit-table';

/** Only the unit machinery of mathjs, so bundles stay small. */
const math = create({ unitDependencies, createUnitDependencies });

// Conventional millimetre of mercury: 1 mm of mercury of density 13 595.1 kg/m³ under standard
// gravity 9.80665 m/s² (from memory). mathjs rounds it to 133.322 Pa, off in the 7th digit.
const MM_HG_PA = 0.001 * 13595.1 * 9.80665;
math.createUnit({ mmHg: `${MM_HG_PA} Pa` }, { override: true });

// Units mathjs lacks, defined from their textbook definitions (not from the figures the tests check).
math.createUnit({
	mph: '1 mi/h',
	knot: '1852 m/h', // international nautical mile per hour
	inHg: '25.4 mmHg', // conventional inch of mercury
	rpm: '360 deg/min',
	rps: '360 deg/s',
	gn: '9.80665 m/s^2' // standard acceleration of gravity (CGPM 1901)
});

/**
 * The affine map between two physical units of one quantity, from mathjs (temperatures have an
 * offset; everything else is a pure factor). Throws a RangeError with a readable message otherwise.
 */
export function unitAffine(from: UnitInfo, to: UnitInfo): Affine {
	if (from.quantity !== to.quantity)
		throw new RangeError(
			`"${from.text}" measures ${QUANTITY_LABELS[from.quantity]} and "${to.text}" measures ${QUANTITY_LABELS[to.quantity]}; they do not convert`
		);
	if (from.math === null || to.math === null) {
		if (from.symbol === to.symbol) return { scale: 1, offset: 0 };
		throw new RangeError(`"${from.text}" and "${to.text}" do not convert into each other`);
	}
	const at = (x: number) => math.unit(x, from.math!).toNumber(to.math!);
	const offset = tidyNumber(at(0));
	return { scale: tidyNumber(at(1) - at(0)), offset };
}
