import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

// The seed publishes this fixture as r1 of the demo workspace's club racer map.
const fixture = JSON.parse(readFileSync('fixtures/club-racer-ecu.map.json', 'utf8')) as {
	name: string;
	frames: { name: string }[];
	alertRules: { name: string; severity: 'advisory' | 'critical'; setpoint: number }[];
};

test('a viewer opens the printable reference sheet of r1: every frame and the alert limits, named by revision', async ({
	page
}) => {
	await signIn(page, 'tuner@framewright.test');
	await page.goto('/w/quillmoor-club-racing/maps');
	await page.getByRole('link', { name: fixture.name, exact: true }).click();
	await page
		.getByRole('list', { name: 'Revision history' })
		.getByRole('link', { name: 'Reference sheet' })
		.last()
		.click();

	await expect(page.getByRole('heading', { level: 1, name: `${fixture.name} — r1` })).toBeVisible();
	for (const frame of fixture.frames) {
		await expect(
			page.getByRole('heading', { level: 2, name: new RegExp(`^${frame.name} `) })
		).toBeVisible();
	}
	const rules = page.getByRole('table', { name: `Alert rules of ${fixture.name} r1` });
	for (const rule of fixture.alertRules) {
		const row = rules.getByRole('row', { name: new RegExp(`^${rule.name}`) });
		await expect(row).toContainText(rule.severity === 'critical' ? 'Critical' : 'Advisory');
		await expect(row).toContainText(String(rule.setpoint));
	}
});
