import { expect, test } from '@playwright/test';

// The API reference page renders the OpenAPI document the server generates: every operation of
// the document is listed (method and path), and the page fits a 390 px wide phone.
test('the API reference lists every route of the OpenAPI document and fits a phone', async ({
	page
}) => {
	const document = await (await page.request.get('/api/openapi.json')).json();
	expect(document.openapi).toBe('3.1.0');
	const operations = Object.entries(
		document.paths as Record<string, Record<string, unknown>>
	).flatMap(([path, item]) => Object.keys(item).map((method) => `${method.toUpperCase()} ${path}`));
	expect(operations.length).toBeGreaterThan(30);

	await page.setViewportSize({ width: 390, height: 844 });
	await page.goto('/reference/api');
	await expect(page.getByRole('heading', { level: 1, name: 'API reference' })).toBeVisible();
	const nav = page.getByRole('navigation', { name: 'Operations' });
	const listed = (await nav.getByRole('link').allTextContents()).map((t) =>
		t.replace(/\s+/g, ' ').trim()
	);
	expect(listed.sort()).toEqual(operations.sort());
	// Each operation has its own card, reached from the list.
	await nav.getByRole('link', { name: 'PUT /api/workspaces/{ws}/maps/{mapId}/draft' }).click();
	await expect(
		page.getByText('Replaces the draft if nobody changed it since `version` (a draft may hold lint')
	).toBeInViewport();
	await expect(page.locator('#schema-LintProblem')).toBeAttached();

	const overflow = await page.evaluate(
		() => document.documentElement.scrollWidth - document.documentElement.clientWidth
	);
	expect(overflow).toBeLessThanOrEqual(0);
});
