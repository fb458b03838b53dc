/**
 * Checks of a map's alert rules that need the map itself or the whole rule list: the watched
 * channel must exist (and be a value, not a counter or checksum), setpoints should be reachable, a band must be a band, names must be unique.
 * Errors make a rule meaningless; warnings are legal but probably unintended.
 */
import { z } from 'zod';
import { rawBounds } from '../codec';
import type { CanMap, Signal } from '../map';
import { formatJsonPath } from '../map-json';
import type { AlertRule } from './rule';

export const alertRuleProblemCodeSchema = z.enum([
	'unknown-frame',
	'unknown-signal',
	'setpoint-out-of-range',
	'role-channel',
	'band-inverted',
	'deadband-closes-band',
	'duplicate-rule-name',
	'duplicate-rule-id'
]);
export type AlertRuleProblemCode = z.infer<typeof alertRuleProblemCodeSchema>;

export interface AlertRuleProblem {
	severity: 'error' | 'warning';
	code: AlertRuleProblemCode;
	message: string;
	ruleIndex: number;
	/** JSON path of the field to fix within the rule list, e.g. `[2].channel.signal`. */
	path: string;
}

/** The physical range a signal may take: its min/max when the map gives them, else what the field can carry. */
function signalRange(signal: Signal): { low: number; high: number; source: string } {
	let low = -Infinity;
	let high = Infinity;
	if (signal.valueType === 'unsigned' || signal.valueType === 'signed') {
		const { lo, hi } = rawBounds(signal);
		const ends = [
			Number(lo) * signal.scale + signal.offset,
			Number(hi) * signal.scale + signal.offset
		];
		[low, high] = [Math.min(...ends), Math.max(...ends)];
	}
	if (signal.min === null && signal.max === null)
		return { low, high, source: 'the values its bit field can carry' };
	return { low: signal.min ?? low, high: signal.max ?? high, source: 'its min/max' };
}

function findSignal(map: CanMap, rule: AlertRule): { frame: boolean; signal: Signal | null } {
	const frame = map.frames.find((f) => f.name === rule.channel.frame);
	return {
		frame: frame !== undefined,
		signal: frame?.signals.find((s) => s.name === rule.channel.signal) ?? null
	};
}

function setpointsOf(rule: AlertRule): { field: string; value: number }[] {
	return rule.condition === 'outside'
		? [
				{ field: 'low', value: rule.low },
				{ field: 'high', value: rule.high }
			]
		: [{ field: 'setpoint', value: rule.setpoint }];
}

export function validateAlertRules(rules: readonly AlertRule[], map: CanMap): AlertRuleProblem[] {
	const problems: AlertRuleProblem[] = [];
	const names = new Map<string, number>();
	const ids = new Map<string, number>();

	rules.forEach((rule, r) => {
		const report = (
			severity: AlertRuleProblem['severity'],
			code: AlertRuleProblemCode,
			message: string,
			field: (string | number)[]
		) =>
			problems.push({ severity, code, message, ruleIndex: r, path: formatJsonPath([r, ...field]) });

		const found = findSignal(map, rule);
		if (!found.frame) {
			report(
				'error',
				'unknown-frame',
				`rule "${rule.name}" watches frame "${rule.channel.frame}", which map "${map.name}" does not have`,
				['channel', 'frame']
			);
		} else if (found.signal === null) {
			report(
				'error',
				'unknown-signal',
				`rule "${rule.name}" watches signal "${rule.channel.signal}", which frame "${rule.channel.frame}" does not have`,
				['channel', 'signal']
			);
		} else if (found.signal.role !== 'value') {
			// A limit on a counter or checksum means nothing physical (docs/map-format.md, "Signal roles").
			report(
				'warning',
				'role-channel',
				`rule "${rule.name}" watches "${found.signal.name}", a ${found.signal.role}: its raw value steps or changes with the frame and means nothing physical, so a limit on it alerts on noise`,
				['channel', 'signal']
			);
		} else {
			const range = signalRange(found.signal);
			const unit = found.signal.unit ? ` ${found.signal.unit}` : '';
			for (const { field, value } of setpointsOf(rule)) {
				if (value < range.low || value > range.high) {
					report(
						'warning',
						'setpoint-out-of-range',
						`rule "${rule.name}" has ${field} ${value}${unit}, outside ${range.low}…${range.high}${unit} (${range.source} of "${found.signal.name}"), so it may never or always fire`,
						[field]
					);
				}
			}
		}

		if (rule.condition === 'outside') {
			if (rule.low >= rule.high) {
				report(
					'error',
					'band-inverted',
					`rule "${rule.name}" has band low ${rule.low} not below high ${rule.high}; the band needs low < high`,
					['low']
				);
			} else if (rule.low + rule.deadband >= rule.high - rule.deadband) {
				report(
					'warning',
					'deadband-closes-band',
					`rule "${rule.name}" has deadband ${rule.deadband}, at least half the band ${rule.low}…${rule.high}, so an alert could never return`,
					['deadband']
				);
			}
		}

		const nameKey = rule.name.toLowerCase();
		const sameName = names.get(nameKey);
		if (sameName === undefined) names.set(nameKey, r);
		else
			report(
				'error',
				'duplicate-rule-name',
				`rule name "${rule.name}" is already used by rule ${sameName} (names are compared ignoring case)`,
				['name']
			);

		const sameId = ids.get(rule.id);
		if (sameId === undefined) ids.set(rule.id, r);
		else
			report(
				'error',
				'duplicate-rule-id',
				`rule id "${rule.id}" is already used by rule ${sameId}`,
				['id']
			);
	});
	return problems;
}
