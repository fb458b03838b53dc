import type { DB, MailboxMessage } from '../db';

export interface MailboxEntry {
	id: string;
	to: string;
	subject: string;
	receivedAt: string;
	text: string;
	links: string[];
}

export function extractLinks(text: string): string[] {
	const found = text.match(/https?:\/\/[^\s<>"')\]]+/g) ?? [];
	// A sentence's full stop or comma right after a link is not part of it.
	return [...new Set(found.map((url) => url.replace(/[.,;:!?]+$/, '')))];
}

function toEntry(row: MailboxMessage): MailboxEntry {
	return {
		id: row.id,
		to: row.to_address,
		subject: row.subject,
		receivedAt: row.received_at,
		text: row.text,
		links: JSON.parse(row.links) as string[]
	};
}

export async function storeMailboxMessage(
	db: DB,
	message: { to: string; from: string; subject: string; text: string; html: string | null }
): Promise<string> {
	const id = crypto.randomUUID();
	await db
		.insertInto('mailbox_messages')
		.values({
			id,
			to_address: message.to.toLowerCase(),
			from_address: message.from,
			subject: message.subject,
			text: message.text,
			html: message.html,
			links: JSON.stringify(extractLinks(message.text)),
			received_at: new Date().toISOString()
		})
		.execute();
	return id;
}

export async function listMailboxMessages(
	db: DB,
	filter: { to?: string } = {}
): Promise<MailboxEntry[]> {
	let query = db
		.selectFrom('mailbox_messages')
		.selectAll()
		.orderBy('received_at', 'desc')
		.orderBy('rowid' as never, 'desc');
	if (filter.to) query = query.where('to_address', '=', filter.to.trim().toLowerCase());
	return (await query.execute()).map(toEntry);
}

export async function findMailboxMessage(db: DB, id: string): Promise<MailboxEntry | null> {
	const row = await db
		.selectFrom('mailbox_messages')
		.selectAll()
		.where('id', '=', id)
		.executeTakeFirst();
	return row ? toEntry(row) : null;
}
