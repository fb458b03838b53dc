import { describe, expect, it } from 'vitest';
import { parseFormula, type FormulaChannel } from './formula';

const channels: FormulaChannel[] = [
	{ index: 0, frameName: 'EngineCore', signalName: 'EngineSpeed' },
	{ index: 1, frameName: 'EngineCore', signalName: 'ManifoldPressure' },
	{ index: 2, frameName: 'Ambient', signalName: 'Pressure' },
	{ index: 3, frameName: 'Rear axle', signalName: 'Oil temp' },
	{ index: 4, frameName: 'Front', signalName: 'Pressure' }
];

const refusal = (text: string) => {
	const r = parseFormula(text, channels);
	if (r.ok) throw new Error(`${text} was accepted`);
	return r.problem;
};

describe('parseFormula: channel names', () => {
	it('names channels by signal, by Frame.Signal, and in braces', () => {
		const r = parseFormula('EngineSpeed + Ambient.Pressure * {Rear axle.Oil temp}', channels);
		expect(r.ok && r.inputs).toEqual([0, 2, 3]);
	});

	it('asks for the frame when a signal name is not unique', () => {
		const p = refusal('ManifoldPressure - Pressure');
		expect(p.message).toContain('Ambient.Pressure');
		expect(p.position).toBe(19);
	});

	it('points at an unknown channel, in plain text or in braces', () => {
		expect(refusal('EngineSpeed + Nope')).toMatchObject({ position: 14 });
		expect(refusal('EngineSpeed + {No such.thing}')).toMatchObject({ position: 14 });
		expect(refusal('EngineSpeed + {Rear axle.Oil temp} - Gone').position).toBe(37);
	});
});

describe('parseFormula: bad formulas get the position of the error', () => {
	it.each([
		['1 + * EngineSpeed', 4],
		['(EngineSpeed + 1', 16],
		['EngineSpeed +', 13],
		['{EngineSpeed', 0],
		['EngineSpeed }', 12],
		['max(EngineSpeed)', 0],
		['EngineSpeed + avg(ManifoldPressure, -1)', 14],
		['EngineSpeed + avg(ManifoldPressure, EngineSpeed)', 14],
		['abs(EngineSpeed, 2)', 0],
		['2 + 3', 0]
	])('%s → position %i', (text, position) => {
		expect(refusal(text).position).toBe(position);
	});

	it('refuses an empty or overlong formula', () => {
		expect(refusal('  ').message).toMatch(/Write a formula/);
		expect(refusal('EngineSpeed+'.repeat(50) + '1').message).toMatch(/at most 500/);
	});
});

describe('parseFormula: nothing outside the safe list is reachable', () => {
	// mathjs can import functions, define units, evaluate and parse text, assign variables and call
	// JavaScript-facing helpers; a formula must reach none of that.
	it.each([
		['import(EngineSpeed, 1)', 'not a formula function'],
		['import({}, {})', 'Empty { }'],
		['createUnit("foo")', 'not a formula function'],
		['evaluate("1 + 1")', 'not a formula function'],
		['parse("1")', 'not a formula function'],
		['compile("1")', 'not a formula function'],
		['simplify(EngineSpeed)', 'not a formula function'],
		['derivative(EngineSpeed, EngineSpeed)', 'not a formula function'],
		['cos(EngineSpeed)', 'not a formula function'],
		['x = 1', 'cannot assign'],
		['f(x) = x', 'cannot assign'],
		['EngineSpeed; 1', 'More than one expression'],
		['[1, 2]', 'A list'],
		['"text" + EngineSpeed', 'Only numbers'],
		['EngineSpeed.constructor', 'No channel'],
		['EngineSpeed[1]', 'Only Frame.Signal'],
		['EngineCore.EngineSpeed.x', 'Only Frame.Signal'],
		['EngineSpeed!', 'cannot be used'],
		['EngineSpeed & 1', 'cannot be used'],
		['1 < EngineSpeed < 3', 'chain of comparisons'],
		['1:3', 'range'],
		['__proto__ + 1', 'No channel']
	])('%s is refused', (text, words) => {
		expect(refusal(text).message).toContain(words);
	});

	it('accepts the whole list of operators and functions', () => {
		const r = parseFormula(
			'abs(-EngineSpeed) + min(EngineSpeed, 2, 3) * max(1, EngineSpeed) / 2 ^ 2 mod 7 + ' +
				'(EngineSpeed > 1 and EngineSpeed <= 3 or not (EngineSpeed == 2) or EngineSpeed != 1) + ' +
				'(EngineSpeed >= 3 ? avg(EngineSpeed, 0.5) : ddt(EngineSpeed)) - integral(EngineSpeed) + 1e3',
			channels
		);
		expect(r.ok).toBe(true);
	});
});
