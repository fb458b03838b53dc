/** Lint problems counted per frame, for the frames table's status column and the page's headline. */
import type { LintProblem } from '$lib/can/lint';

export interface LintCount {
	errors: number;
	warnings: number;
}

export function countBySeverity(problems: readonly LintProblem[]): LintCount {
	let errors = 0;
	for (const p of problems) if (p.severity === 'error') errors++;
	return { errors, warnings: problems.length - errors };
}

/** Problems of each frame index (signal problems count for their frame). */
export function lintByFrame(problems: readonly LintProblem[]): Map<number, LintCount> {
	const out = new Map<number, LintCount>();
	for (const p of problems) {
		if (p.frameIndex === null) continue;
		const count = out.get(p.frameIndex) ?? { errors: 0, warnings: 0 };
		if (p.severity === 'error') count.errors++;
		else count.warnings++;
		out.set(p.frameIndex, count);
	}
	return out;
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** "2 errors, 1 warning", or "No problems". Words, not just a colour, carry the status. */
export function describeCount(count: LintCount): string {
	const parts = [];
	if (count.errors) parts.push(plural(count.errors, 'error'));
	if (count.warnings) parts.push(plural(count.warnings, 'warning'));
	return parts.length ? parts.join(', ') : 'No problems';
}
