import { error } from '@sveltejs/kit';
import { listMailboxMessages } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (!locals.services.config.demoMode) error(404, 'Not found');
	const to = url.searchParams.get('to')?.trim() || undefined;
	return { to: to ?? null, messages: await listMailboxMessages(locals.services.db, { to }) };
}) satisfies PageServerLoad;
