import { describe, expect, it } from 'vitest';
import { ApiError, fieldIssues, membersApi } from './members-api';

/** A stand-in for window.fetch that records the request and answers with the given response. */
function fakeFetch(status: number, body?: unknown) {
	const calls: { url: string; init?: RequestInit }[] = [];
	const fetcher = (async (url: string, init?: RequestInit) => {
		calls.push({ url, init });
		return new Response(body === undefined ? null : JSON.stringify(body), {
			status,
			headers: { 'content-type': 'application/json' }
		});
	}) as typeof fetch;
	return { fetcher, calls };
}

describe('membersApi', () => {
	it('sends JSON to the contract URL and returns the parsed body', async () => {
		const { fetcher, calls } = fakeFetch(200, { member: { userId: 'u 1', role: 'viewer' } });
		const result = await membersApi('bench-a', fetcher).changeRole('u 1', 'viewer');
		expect(result.member.role).toBe('viewer');
		expect(calls[0].url).toBe('/api/workspaces/bench-a/members/u%201');
		expect(calls[0].init?.method).toBe('PATCH');
		expect(JSON.parse(String(calls[0].init?.body))).toEqual({ role: 'viewer' });
	});

	it('treats 204 as success without a body', async () => {
		const { fetcher } = fakeFetch(204);
		await expect(membersApi('bench-a', fetcher).revoke('inv1')).resolves.toBeUndefined();
	});

	it("keeps the server's own message and field issues", async () => {
		const issues = [{ path: 'email', message: 'Enter a valid e-mail address.' }];
		const { fetcher } = fakeFetch(400, { error: 'The request has invalid fields.', issues });
		const failure = await membersApi('bench-a', fetcher)
			.invite('nope', 'viewer')
			.catch((e: unknown) => e);
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
		const failure = await membersApi('bench-a', fakeFetch(status).fetcher)
			.overview()
			.catch((e: unknown) => e);
		expect((failure as Error).message).toMatch(message);
	});

	it('reports an unreachable server as such', async () => {
		const offline = (async () => {
			throw new TypeError('Failed to fetch');
		}) as typeof fetch;
		await expect(membersApi('bench-a', offline).overview()).rejects.toThrow(/could not be reached/);
	});
});
