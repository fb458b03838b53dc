import { describe, expect, it } from 'vitest';
import { ApiError, callApi, endpointUrl, fieldIssues, isStale, workspaceApi } from './client';
import { revisionLabel, revisionRefSchema } from './maps';
import { capturePaths, mapPaths } from './paths';

/** A stand-in for window.fetch that records each request and answers with the given response. */
function fakeFetch(status: number, body?: unknown) {
	const calls: { url: string; method?: string; body?: unknown; signal?: AbortSignal | null }[] = [];
	const fetcher = (async (url: string, init?: RequestInit) => {
		calls.push({
			url,
			method: init?.method,
			body: init?.body ? JSON.parse(String(init.body)) : undefined,
			signal: init?.signal
		});
		return new Response(body === undefined ? null : JSON.stringify(body), {
			status,
			headers: { 'content-type': 'application/json' }
		});
	}) as typeof fetch;
	return { fetcher, calls };
}

describe('calls built from the endpoint list', () => {
	it('saves the draft with its version to the contract URL, path parameters encoded', async () => {
		const { fetcher, calls } = fakeFetch(200, { version: 8, lint: [] });
		const draft = { format: 'framewright-map@1' as const, name: 'Bench', frames: [] };
		const result = await workspaceApi('team a', fetcher)('maps.saveDraft', {
			params: { mapId: 'm/1' },
			body: { version: 7, draft }
		});
		expect(result.version).toBe(8);
		expect(calls).toEqual([
			{
				url: '/api/workspaces/team%20a/maps/m%2F1/draft',
				method: 'PUT',
				body: { version: 7, draft },
				signal: undefined
			}
		]);
	});

	it('sends JSON to the members URL and returns the parsed body', async () => {
		const { fetcher, calls } = fakeFetch(200, { member: { userId: 'u 1', role: 'viewer' } });
		const result = await workspaceApi('bench-a', fetcher)('members.changeRole', {
			params: { userId: 'u 1' },
			body: { role: 'viewer' }
		});
		expect(result.member.role).toBe('viewer');
		expect(calls[0]).toMatchObject({
			url: '/api/workspaces/bench-a/members/u%201',
			method: 'PATCH',
			body: { role: 'viewer' }
		});
	});

	it('puts the query in the URL (numbers as text, absent values left out) and passes the abort signal', async () => {
		const { fetcher, calls } = fakeFetch(200, { total: 0, frames: [] });
		const controller = new AbortController();
		await callApi(
			'captures.frames',
			{
				params: { ws: 'club', id: 'c1' },
				query: { offset: 200, limit: 100, id: undefined },
				signal: controller.signal
			},
			fetcher
		);
		expect(calls[0].url).toBe('/api/workspaces/club/captures/c1/frames?offset=200&limit=100');
		expect(calls[0].method).toBe('GET');
		expect(calls[0].signal).toBe(controller.signal);
	});

	it('asks for a diff between a revision and the draft', async () => {
		const { fetcher, calls } = fakeFetch(200, { diff: { frames: [], changes: [] } });
		await workspaceApi('a', fetcher)('maps.diff', {
			params: { mapId: 'm1' },
			query: { from: 1, to: 'draft' }
		});
		expect(calls[0].url).toBe('/api/workspaces/a/maps/m1/diff?from=1&to=draft');
	});

	it('creates a share link with an optional expiry and revokes it with DELETE (204 → undefined)', async () => {
		const { fetcher, calls } = fakeFetch(201, {
			shareLink: { id: 's1', url: '/s/t', revision: 2, expiresAt: null }
		});
		await workspaceApi('a', fetcher)('maps.createShareLink', {
			params: { mapId: 'm1' },
			body: { revision: 2, expiresAt: null }
		});
		expect(calls[0]).toMatchObject({
			url: '/api/workspaces/a/maps/m1/share-links',
			method: 'POST',
			body: { revision: 2, expiresAt: null }
		});
		const del = fakeFetch(204);
		await expect(
			workspaceApi('a', del.fetcher)('maps.revokeShareLink', { params: { mapId: 'm1', id: 's1' } })
		).resolves.toBeUndefined();
		expect(del.calls[0]).toMatchObject({
			url: '/api/workspaces/a/maps/m1/share-links/s1',
			method: 'DELETE'
		});
	});
});

describe('failures', () => {
	it("keeps a stale save's message and the server's current version", async () => {
		const error =
			'This map was changed by Calibrator at 10:02 since you loaded it. Reload to see their changes; your edit was not saved.';
		const { fetcher } = fakeFetch(409, { error, currentVersion: 9 });
		const failure = await workspaceApi('team-a', fetcher)('maps.saveDraft', {
			params: { mapId: 'm1' },
			body: { version: 7, draft: { format: 'framewright-map@1', name: 'x' } }
		}).catch((e: unknown) => e);
		expect(failure).toBeInstanceOf(ApiError);
		expect((failure as ApiError).message).toBe(error);
		expect((failure as ApiError).body.currentVersion).toBe(9);
		expect(isStale(failure)).toBe(true);
	});

	it('lists lint problems a refused publish carries, and words a bare 422 from the contract', async () => {
		const issues = [{ path: 'frames[0].signals[1].startBit', message: 'overlaps "Rpm"' }];
		const publish = (fetcher: typeof fetch) =>
			workspaceApi('a', fetcher)('maps.publish', {
				params: { mapId: 'm1' },
				body: { note: 'note', version: 3 }
			}).catch((e: unknown) => e);
		const refused = await publish(
			fakeFetch(422, { error: 'Fix 1 lint error first.', issues }).fetcher
		);
		expect((refused as ApiError).issues).toEqual(issues);
		const bare = await publish(fakeFetch(422).fetcher);
		expect((bare as Error).message).toMatch(/lint errors/);
		expect(isStale(bare)).toBe(false);
	});

	it("keeps the server's own message and field issues", async () => {
		const issues = [{ path: 'email', message: 'Enter a valid e-mail address.' }];
		const { fetcher } = fakeFetch(400, { error: 'The request has invalid fields.', issues });
		const failure = await workspaceApi('bench-a', fetcher)('invitations.create', {
			body: { email: 'nope', role: 'viewer' }
		}).catch((e: unknown) => e);
		expect(failure).toBeInstanceOf(ApiError);
		expect((failure as ApiError).status).toBe(400);
		expect((failure as ApiError).message).toBe('The request has invalid fields.');
		expect(fieldIssues(failure)).toEqual({ email: ['Enter a valid e-mail address.'] });
	});

	it.each([
		[401, /sign in again/i],
		[403, /role .* does not allow/i],
		[409, /without an owner/i],
		[502, /answered 502/]
	])('explains a %i without a body in words', async (status, message) => {
		const failure = await workspaceApi('bench-a', fakeFetch(status).fetcher)('members.changeRole', {
			params: { userId: 'u1' },
			body: { role: 'owner' }
		}).catch((e: unknown) => e);
		expect((failure as Error).message).toMatch(message);
	});

	it('reports an unreachable server as such', async () => {
		const offline = (async () => {
			throw new TypeError('Failed to fetch');
		}) as typeof fetch;
		await expect(workspaceApi('bench-a', offline)('members.list')).rejects.toThrow(
			/could not be reached/
		);
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
		const parsed = revisionRefSchema.safeParse(text);
		expect(parsed.success ? parsed.data : null).toBe(ref);
	});

	it('builds the export, sheet and diff URLs the server routes answer', () => {
		const paths = mapPaths('club', 'm1');
		expect(paths.exportFile(2, 'csv')).toBe('/w/club/maps/m1/export?rev=2&format=csv');
		expect(paths.sheet('draft')).toBe('/w/club/maps/m1/sheet?rev=draft');
		expect(paths.diff(1, 2)).toBe('/w/club/maps/m1/diff?from=1&to=2');
		expect(paths.frame(0)).toBe('/w/club/maps/m1/frames/0');
		expect(revisionLabel(4)).toBe('r4');
	});

	it('builds capture downloads with only the parameters their kind uses', () => {
		const paths = capturePaths('club');
		expect(paths.exportFile('c1', 'frames', null)).toBe('/w/club/captures/c1/export?kind=frames');
		expect(paths.exportFile('c1', 'wide', 'd1', { interval: 0.5, mode: 'mean' })).toBe(
			'/w/club/captures/c1/export?kind=wide&decode=d1&interval=0.5&mode=mean'
		);
		expect(paths.exportFile('c1', 'long', 'd1', { interval: 0.5, mode: 'mean' })).toBe(
			'/w/club/captures/c1/export?kind=long&decode=d1'
		);
		expect(
			endpointUrl('captures.upload', { params: { ws: 'club' }, query: { name: 'a b.csv' } })
		).toBe('/api/workspaces/club/captures?name=a+b.csv');
	});
});
