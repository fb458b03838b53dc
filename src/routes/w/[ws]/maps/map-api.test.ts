import { describe, expect, it } from 'vitest';
import { ApiError } from '$lib/api/client';
import { isStale, mapPaths, mapsApi, parseRevisionRef, revisionLabel } from './map-api';

/** A stand-in for window.fetch that records each request and answers with the given response. */
function fakeFetch(status: number, body?: unknown) {
	const calls: { url: string; method?: string; body?: unknown }[] = [];
	const fetcher = (async (url: string, init?: RequestInit) => {
		calls.push({
			url,
			method: init?.method,
			body: init?.body ? JSON.parse(String(init.body)) : undefined
		});
		return new Response(body === undefined ? null : JSON.stringify(body), {
			status,
			headers: { 'content-type': 'application/json' }
		});
	}) as typeof fetch;
	return { fetcher, calls };
}

describe('mapsApi', () => {
	it('saves the draft with its version to the contract URL', async () => {
		const { fetcher, calls } = fakeFetch(200, { version: 8, lint: [] });
		const draft = { format: 'framewright-map@1' as const, name: 'Bench', frames: [] };
		const result = await mapsApi('team a', fetcher).saveDraft('m/1', 7, draft);
		expect(result.version).toBe(8);
		expect(calls).toEqual([
			{
				url: '/api/workspaces/team%20a/maps/m%2F1/draft',
				method: 'PUT',
				body: { version: 7, draft }
			}
		]);
	});

	it("keeps a stale save's message and the server's current version", async () => {
		const error =
			'This map was changed by Calibrator at 10:02 since you loaded it. Reload to see their changes; your edit was not saved.';
		const { fetcher } = fakeFetch(409, { error, currentVersion: 9 });
		const failure = await mapsApi('team-a', fetcher)
			.saveDraft('m1', 7, { format: 'framewright-map@1', name: 'x' })
			.catch((e: unknown) => e);
		expect(failure).toBeInstanceOf(ApiError);
		expect((failure as ApiError).message).toBe(error);
		expect((failure as ApiError).body.currentVersion).toBe(9);
		expect(isStale(failure)).toBe(true);
	});

	it('lists lint problems a refused publish carries, and words a bare 422', async () => {
		const issues = [{ path: 'frames[0].signals[1].startBit', message: 'overlaps "Rpm"' }];
		const refused = await mapsApi(
			'a',
			fakeFetch(422, { error: 'Fix 1 lint error first.', issues }).fetcher
		)
			.publish('m1', 'note', 3)
			.catch((e: unknown) => e);
		expect((refused as ApiError).issues).toEqual(issues);
		const bare = await mapsApi('a', fakeFetch(422).fetcher)
			.publish('m1', 'note', 3)
			.catch((e: unknown) => e);
		expect((bare as Error).message).toMatch(/lint errors/);
		expect(isStale(bare)).toBe(false);
	});

	it('asks for a diff between a revision and the draft', async () => {
		const { fetcher, calls } = fakeFetch(200, { diff: { frames: [], changes: [] } });
		await mapsApi('a', fetcher).diff('m1', 1, 'draft');
		expect(calls[0].url).toBe('/api/workspaces/a/maps/m1/diff?from=1&to=draft');
	});

	it('creates a share link with an optional expiry and revokes it with DELETE', async () => {
		const { fetcher, calls } = fakeFetch(201, {
			shareLink: { id: 's1', url: '/s/t', revision: 2, expiresAt: null }
		});
		await mapsApi('a', fetcher).createShareLink('m1', 2, null);
		expect(calls[0]).toEqual({
			url: '/api/workspaces/a/maps/m1/share-links',
			method: 'POST',
			body: { revision: 2, expiresAt: null }
		});
		const del = fakeFetch(204);
		await expect(mapsApi('a', del.fetcher).revokeShareLink('m1', 's1')).resolves.toBeUndefined();
		expect(del.calls[0].method).toBe('DELETE');
	});
});

describe('revision references and page paths', () => {
	it.each([
		['3', 3],
		['r12', 12],
		['DRAFT', 'draft'],
		['0', null],
		['r', null],
		['1e3', null],
		[null, null]
	])('reads %s as %s', (text, ref) => {
		expect(parseRevisionRef(text)).toBe(ref);
	});

	it('builds the export, sheet and diff URLs the server routes answer', () => {
		const paths = mapPaths('club', 'm1');
		expect(paths.exportFile(2, 'csv')).toBe('/w/club/maps/m1/export?rev=2&format=csv');
		expect(paths.sheet('draft')).toBe('/w/club/maps/m1/sheet?rev=draft');
		expect(paths.diff(1, 2)).toBe('/w/club/maps/m1/diff?from=1&to=2');
		expect(paths.frame(0)).toBe('/w/club/maps/m1/frames/0');
		expect(revisionLabel(4)).toBe('r4');
	});
});
