import { describe, expect, it } from 'vitest';
import { signalRoleSchema } from './can/map';
import { isValueRole, ROLE_BADGE, valueChannels } from './signal-roles';

describe('signal roles in the views', () => {
	it('badges counters and checksums in words, values not at all', () => {
		expect(signalRoleSchema.options.map((r) => [r, ROLE_BADGE[r]])).toEqual([
			['value', null],
			['counter', 'counter'],
			['checksum', 'checksum']
		]);
	});

	it('keeps values (and entries without a role) in order, dropping counters and checksums', () => {
		const channels = [
			{ name: 'Alive', role: 'counter' as const },
			{ name: 'Speed', role: 'value' as const },
			{ name: 'Crc', role: 'checksum' as const },
			{ name: 'Derived' }
		];
		expect(valueChannels(channels).map((c) => c.name)).toEqual(['Speed', 'Derived']);
		expect([isValueRole(undefined), isValueRole('value'), isValueRole('counter')]).toEqual([
			true,
			true,
			false
		]);
	});
});
