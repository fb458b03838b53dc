// The modules the browser and the API contract load (profile schema, unit table, link shape,
// scaling and the result shapes) must not pull in mathjs: only units.ts may, and pages never
// import it. This walks the relative imports of each source file, as a bundler would, and fails
// naming the path to mathjs.
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const here = dirname(fileURLToPath(import.meta.url));

/** Import specifiers of a TypeScript file, type-only imports left out (they vanish when compiled). */
function importsOf(file: string): string[] {
	const text = readFileSync(file, 'utf8');
	const found: string[] = [];
	for (const m of text.matchAll(/^(?:import|export)\s+(type\s+)?[^'"]*?from\s+'([^']+)'/gms))
		if (!m[1]) found.push(m[2]);
	return found;
}

/** The chain of files from `entry` to a bare import of `banned`, or null when there is none. */
function pathTo(entry: string, banned: string): string[] | null {
	const seen = new Set<string>();
	const walk = (file: string, trail: string[]): string[] | null => {
		if (seen.has(file)) return null;
		seen.add(file);
		for (const spec of importsOf(file)) {
			if (spec === banned || spec.startsWith(`${banned}/`)) return [...trail, file, spec];
			if (!spec.startsWith('.')) continue;
			const target = resolve(dirname(file), spec);
			const next = spec.endsWith('.json') ? null : `${target}.ts`;
			if (next) {
				const hit = walk(next, [...trail, file]);
				if (hit) return hit;
			}
		}
		return null;
	};
	return walk(entry, []);
}

describe('modules the browser loads stay without mathjs', () => {
	it.each([
		'profile.ts',
		'unit-table.ts',
		'scaling.ts',
		'link-schema.ts',
		'quantities.ts',
		// The result shapes the API contract names (src/lib/api/receivers.ts).
		'link-report-schema.ts',
		'relink-result-schema.ts',
		'capture-check-schema.ts',
		'profile-diff.ts'
	])('%s', (file) => {
		expect(pathTo(resolve(here, file), 'mathjs')).toBeNull();
	});

	it('finds mathjs where it is (the walk itself works)', () => {
		expect(pathTo(resolve(here, 'linking.ts'), 'mathjs')?.at(-1)).toBe('mathjs');
	});
});
