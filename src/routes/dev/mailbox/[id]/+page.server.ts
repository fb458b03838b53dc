import { error } from '@sveltejs/kit';
import { findMailboxMessage } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

export const load = (async ({ locals, params }) => {
	if (!locals.services.config.demoMode) error(404, 'Not found');
	const message = await findMailboxMessage(locals.services.db, params.id);
	if (!message) error(404, 'No message with that id in the demo mailbox.');
	return { message };
}) satisfies PageServerLoad;
