/**
 * What the audit log needs to know about the request a change is made in, without passing it through
 * every domain function: the access token the caller used, if any. The request pipeline
 * (hooks.server.ts) opens a context per request; the guard records the token once it accepts it;
 * `appendAudit` reads it, so every audit row of a change made with a token names that token.
 */
import { AsyncLocalStorage } from 'node:async_hooks';

interface RequestContext {
	tokenId: string | null;
}

const storage = new AsyncLocalStorage<RequestContext>();

/** Runs `work` (the rest of the request) in a fresh context. */
export function withRequestContext<T>(work: () => T): T {
	return storage.run({ tokenId: null }, work);
}

/** Records the access token the guard accepted for this request. */
export function setActingToken(tokenId: string): void {
	const context = storage.getStore();
	if (context) context.tokenId = tokenId;
}

/** The access token of the current request, or null (a session, a script, a test outside a request). */
export function actingToken(): string | null {
	return storage.getStore()?.tokenId ?? null;
}
