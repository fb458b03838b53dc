import { describe, expect, it } from 'vitest';
import { fieldBitPositions } from '../bits';
import { referencePositions } from '../testing/reference-bits';
import { bitAbove, bitBelow, chainOrder, fieldBits } from './chain';

describe('bit chains', () => {
	it('fieldBits walks every field of an 8-byte payload like the slow reference walk', () => {
		// Reference: design rule walked bit by bit (testing/reference-bits.ts).
		for (const order of ['little', 'big'] as const) {
			for (let start = 0; start < 64; start++) {
				for (let length = 1; length <= 16; length++) {
					const expected = referencePositions(start, length, order);
					if (expected.some((p) => p < 0 || p >= 64)) continue;
					expect(fieldBits(start, length, order, 8)).toEqual(expected);
					expect(fieldBitPositions(start, length, order)).toEqual(expected);
				}
			}
		}
	});

	it('bitBelow undoes bitAbove, and the chain order climbs with bitAbove', () => {
		for (const order of ['little', 'big'] as const) {
			const chain = chainOrder(order, 4);
			expect(new Set(chain).size).toBe(32);
			for (let i = 0; i + 1 < chain.length; i++) {
				expect(bitAbove(chain[i], order, 4)).toBe(chain[i + 1]);
				expect(bitBelow(chain[i + 1], order, 4)).toBe(chain[i]);
			}
			expect(bitAbove(chain[31], order, 4)).toBe(-1);
			expect(bitBelow(chain[0], order, 4)).toBe(-1);
		}
	});
});
