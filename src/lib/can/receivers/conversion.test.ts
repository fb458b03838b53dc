import { create, unitDependencies } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { decodeSignal } from '../codec';
import { signalSchema, type Signal } from '../map';
import { seededRandom } from '../testing/seeded-random';
import {
	applyConversion,
	composeScaling,
	conversionSchema,
	describeConversion,
	makeConversion,
	scaledValue,
	type Conversion
} from './conversion';
import { FUELS } from './quantities';

function convert(from: string, to: string, fuel: keyof typeof FUELS | null = null): Conversion {
	const result = makeConversion({ unit: from }, { unit: to }, fuel);
	if (!result.ok) throw new Error(result.message);
	return result.conversion;
}

describe('mixture conversions (trade rules, common practice)', () => {
	// Stoichiometric air–fuel ratios by mass, common practice (from memory): gasoline 14.7:1,
	// E85 9.8:1, ethanol 9.0:1, methanol 6.4:1, diesel 14.5:1, LPG 15.5:1, CNG 17.2:1.
	it.each([
		['gasoline', 14.7],
		['e85', 9.8],
		['ethanol', 9.0],
		['methanol', 6.4],
		['diesel', 14.5],
		['lpg', 15.5],
		['cng', 17.2]
	] as const)('λ = 1 is a stoichiometric %s mixture: AFR %d (common practice)', (fuel, afr) => {
		expect(applyConversion(convert('λ', 'AFR', fuel), 1)).toBeCloseTo(afr, 12);
		expect(applyConversion(convert('AFR', 'λ', fuel), afr)).toBeCloseTo(1, 12);
	});

	it('λ 0.85 on gasoline reads AFR 12.495 (rich), and back (common practice)', () => {
		expect(applyConversion(convert('λ', 'AFR', 'gasoline'), 0.85)).toBeCloseTo(0.85 * 14.7, 12);
	});

	it('φ = 1/λ (definition of the equivalence ratio): reciprocal, not linear', () => {
		const toPhi = convert('λ', 'φ');
		expect(toPhi.form).toBe('reciprocal');
		expect(applyConversion(toPhi, 0.8)).toBeCloseTo(1.25, 12);
		expect(applyConversion(convert('φ', 'λ'), 1.25)).toBeCloseTo(0.8, 12);
	});

	it('φ ↔ AFR goes through λ: AFR = stoichiometric AFR / φ', () => {
		// E85, φ = 1.1 (10 % rich): λ = 1/1.1, AFR = 9.8/1.1 (common practice stoichiometric ratio).
		expect(applyConversion(convert('φ', 'AFR', 'e85'), 1.1)).toBeCloseTo(9.8 / 1.1, 12);
		expect(applyConversion(convert('AFR', 'φ', 'e85'), 9.8 / 1.1)).toBeCloseTo(1.1, 12);
	});

	it('an air–fuel ratio without a fuel is refused, naming the fuels', () => {
		const result = makeConversion({ unit: 'λ' }, { unit: 'AFR' });
		expect(result.ok).toBe(false);
		if (!result.ok)
			expect(result.message).toMatch(
				/^converting λ to AFR needs a fuel for its stoichiometric air–fuel ratio \(gasoline 14\.7, e85 9\.8,/
			);
		expect(makeConversion({ unit: 'λ' }, { unit: 'φ' }).ok).toBe(true); // no fuel needed
	});

	it('describes conversions for people, marking the reciprocal ones', () => {
		expect(describeConversion(convert('°F', '°C'))).toBe('°F → °C: × 0.555556 − 17.7778');
		expect(describeConversion(convert('λ', 'AFR', 'gasoline'))).toBe(
			'λ → AFR (gasoline, stoichiometric AFR 14.7, common practice): × 14.7'
		);
		expect(describeConversion(convert('φ', 'λ'))).toBe(
			'φ → λ: 1 ÷ value — not linear, the device must divide (needs device-side inversion)'
		);
		expect(describeConversion(convert('kPa', 'kPa'))).toBe('kPa → kPa: no conversion');
	});

	it('the stored conversion schema refuses a reciprocal with an offset', () => {
		const bad = conversionSchema.safeParse({ ...convert('φ', 'λ'), offset: 1 });
		expect(bad.success).toBe(false);
		expect(bad.error?.issues[0]).toMatchObject({
			path: ['offset'],
			message: 'a reciprocal conversion has offset 0'
		});
	});
});

describe('composed scale and offset (property test)', () => {
	// Reference: the project's codec decodes a payload with the map's signal, then the conversion is
	// applied afterwards — by the test's own affine formula, or by mathjs directly for units. The
	// receive-set path decodes the same bits with the composed scale/offset in one step.
	const reference = create({ unitDependencies });

	function randomSignal(rng: ReturnType<typeof seededRandom>): Signal {
		const valueType = rng.pick(['unsigned', 'signed', 'unsigned', 'float32', 'float64'] as const);
		const length =
			valueType === 'float32'
				? 32
				: valueType === 'float64'
					? 64
					: rng.int(1, valueType === 'signed' ? 32 : 40);
		const byteOrder = rng.pick(['little', 'big'] as const);
		// Little-endian fields climb from startBit, so this always fits 8 bytes; a big-endian one
		// that runs past byte 0 makes the codec throw and the case is skipped.
		const startBit = byteOrder === 'little' ? rng.int(0, 64 - length) : rng.int(0, 63);
		return signalSchema.parse({
			name: 'x',
			startBit,
			length,
			byteOrder,
			valueType,
			scale: rng.pick([1, 0.1, 0.01, 0.125, 0.03125, -0.5, 4, 1e-3]),
			offset: rng.pick([0, -40, -273, 100, 0.5, -125])
		});
	}

	const tolerance = (...terms: number[]) => 1e-9 * (1 + terms.reduce((s, t) => s + Math.abs(t), 0));

	it('raw → receive-set scaling equals map decode + affine conversion, for 2000 random cases', () => {
		const rng = seededRandom(0x5eed12);
		let compared = 0;
		for (let i = 0; i < 2000; i++) {
			const signal = randomSignal(rng);
			const data = rng.bytes(8);
			let decoded;
			try {
				decoded = decodeSignal(signal, data);
			} catch {
				continue; // a layout that does not fit 8 bytes; the generator allows a few
			}
			if (!Number.isFinite(decoded.value)) continue; // NaN/∞ float payloads
			const a = (rng.next() - 0.5) * 200;
			const b = (rng.next() - 0.5) * 1000;
			const conversion: Conversion = {
				kind: 'units',
				from: 'x',
				to: 'y',
				form: 'linear',
				scale: a,
				offset: b,
				fuel: null
			};
			const expected = decoded.value * a + b;
			const composed = composeScaling(signal, conversion);
			// The device's path: the codec with the composed scale/offset in place of the map's.
			const viaSet = decodeSignal({ ...signal, ...composed }, data).value;
			expect(Math.abs(viaSet - expected)).toBeLessThanOrEqual(
				tolerance(Number(decoded.raw) * signal.scale * a, signal.offset * a, b)
			);
			expect(scaledValue(composed, Number(decoded.raw))).toBeCloseTo(viaSet, 6);
			compared++;
		}
		expect(compared).toBeGreaterThan(1500);
	});

	it('unit conversions compose too: checked against mathjs converting the decoded value', () => {
		const rng = seededRandom(811);
		const pairs: [string, string, string, string][] = [
			// [our unit, device unit, mathjs from, mathjs to]
			['°C', '°F', 'degC', 'degF'],
			['kPa', 'psi', 'kPa', 'psi'],
			['km/h', 'mph', 'km/h', 'mi/h'],
			['K', '°C', 'K', 'degC'],
			['bar', 'kPa', 'bar', 'kPa'],
			['L/h', 'gal/h', 'L/h', 'gal/h']
		];
		for (let i = 0; i < 600; i++) {
			const signal = randomSignal(rng);
			const data = rng.bytes(8);
			let decoded;
			try {
				decoded = decodeSignal(signal, data);
			} catch {
				continue;
			}
			if (!Number.isFinite(decoded.value) || Math.abs(decoded.value) > 1e12) continue;
			const [from, to, mFrom, mTo] = rng.pick(pairs);
			const expected = reference.unit(decoded.value, mFrom).toNumber(mTo);
			const viaSet = decodeSignal(
				{ ...signal, ...composeScaling(signal, convert(from, to)) },
				data
			).value;
			expect(Math.abs(viaSet - expected), `${from} → ${to}`).toBeLessThanOrEqual(
				1e-9 * (1 + Math.abs(expected) + Math.abs(Number(decoded.raw) * signal.scale) * 2)
			);
		}
	});

	it('a reciprocal link decodes as 1 / (raw × scale + offset): φ signal shown as AFR', () => {
		// φ × 1000 in 16 bits (invented layout); AFR = 14.7 / φ (common practice, gasoline).
		const signal = signalSchema.parse({ name: 'phi', startBit: 0, length: 16, scale: 0.001 });
		const composed = composeScaling(signal, convert('φ', 'AFR', 'gasoline'));
		expect(composed.form).toBe('reciprocal');
		const rng = seededRandom(42);
		for (let i = 0; i < 200; i++) {
			const raw = rng.int(500, 2000);
			const phi = raw * 0.001;
			expect(scaledValue(composed, raw)).toBeCloseTo(14.7 / phi, 9);
		}
	});
});
