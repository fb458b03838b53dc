import { describe, expect, it } from 'vitest';
import {
	cName,
	codegenPrefixSchema,
	isReservedWord,
	preferredName,
	snakeCase
} from './identifiers';

describe('snakeCase', () => {
	// Expected values worked out by hand from the rule in docs/codegen.md: an underscore before every
	// upper-case letter that follows a lower-case letter or a digit, lower case, other runs → one "_".
	it.each([
		// the two examples the rule is stated with
		['EngineCore', 'engine_core'],
		['F2B0_S16', 'f2_b0_s16'],
		// traps
		['engineSpeed', 'engine_speed'],
		['ABS', 'abs'], // upper after upper: no underscore
		['HTTPServer', 'httpserver'],
		['Temp2Max', 'temp2_max'], // upper after a digit
		['x1Y2z', 'x1_y2z'],
		['already_snake', 'already_snake'],
		['a--__b', 'a_b'], // one run, one underscore
		['Engine Speed (rpm)', 'engine_speed_rpm_'], // the rule keeps a trailing run
		['°C', '_c'],
		['Öl-Temp', '_l_temp'], // letters outside ASCII are other characters
		['\u212Aelvin', '_elvin'], // the Kelvin sign must not turn into an ASCII "k"
		['2ndGear', '2nd_gear'],
		['aB_C', 'a_b_c'],
		['', '']
	])('%j → %j', (name, expected) => {
		expect(snakeCase(name)).toBe(expected);
	});
});

describe('cName and preferredName', () => {
	it('drops leading and trailing underscores so joined names never hold "__"', () => {
		expect(cName('Engine Speed (rpm)')).toBe('engine_speed_rpm');
		expect(cName('_private_')).toBe('private');
		expect(cName('°')).toBe('');
	});

	it.each([
		['Speed', true, 'speed', null],
		['int', true, 's_int', /keyword/],
		['class', true, 's_class', /keyword/], // C++ keyword: the header may be included from C++
		['2ndGear', true, 's_2nd_gear', /cannot start with a digit/],
		['2ndGear', false, '2nd_gear', null], // a frame name always follows the prefix
		['°', true, 'fallback', /no letters or digits/],
		['(Boost)', true, 'boost', /underscores of _boost_ are dropped/]
	] as const)('%j (member %s) → %s', (name, member, base, why) => {
		const result = preferredName(name, 'fallback', member);
		expect(result.base).toBe(base);
		if (why === null) expect(result.adjusted).toBeNull();
		else expect(result.adjusted).toMatch(why);
	});

	it('knows C99, C23 and C++ keywords (ISO/IEC 9899:1999 6.4.1, C23 6.4.1, C++ [lex.key]) and the errno macro (C99 7.5) (from memory)', () => {
		for (const word of ['int', 'restrict', 'inline', 'bool', 'nullptr', 'template', 'xor', 'errno'])
			expect(isReservedWord(word)).toBe(true);
		for (const word of ['speed', 'page', 'integer']) expect(isReservedWord(word)).toBe(false);
	});
});

describe('codegenPrefixSchema', () => {
	it.each(['fw', 'ecu2', 'my_ecu', 'a'])('accepts %j', (prefix) => {
		expect(codegenPrefixSchema.safeParse(prefix).success).toBe(true);
	});

	it.each([
		['', /lower-case letter/],
		['Fw', /lower-case letter/],
		['2fw', /lower-case letter/],
		['fw_', /single underscores inside/],
		['fw__x', /single underscores inside/],
		['_fw', /lower-case letter/],
		['fw-x', /lower-case letter/],
		['int', /reserves/], // C99 7.26.8: typedef names int…_t / uint…_t
		['uint8', /reserves/],
		['sig', /reserves/], // C99 7.26.6: SIG_… macros
		['lc', /reserves/], // C99 7.26.5: LC_… macros
		['a'.repeat(33), /at most 32/]
	])('refuses %j', (prefix, message) => {
		const result = codegenPrefixSchema.safeParse(prefix);
		expect(result.success).toBe(false);
		expect(result.error?.issues[0].message).toMatch(message);
	});
});
