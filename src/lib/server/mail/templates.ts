import type { OutgoingMail } from './send';

function escapeHtml(text: string): string {
	return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

/** Web addresses, www. names, e-mail addresses and bare domain names (what mail programs turn into links). */
const LINK_LIKE =
	/\b[a-z][a-z0-9+.-]*:\/\/\S*|\bwww\.\S*|[^\s@"]+@[^\s@"]+\.[^\s@"]+|\b(?:[a-z0-9-]+\.)+[a-z]{2,63}\b(?:[/:?#]\S*)?/gi;

/**
 * Text a member typed (a workspace, map or person name, a note), made safe to quote in a mail:
 * one line, links and anything a mail program would make into one replaced by "[link removed]",
 * double quotes turned single so the quoting stays unambiguous, clipped to `max` characters. Only
 * the product's own link in a mail is a link, so a workspace named like a phishing notice carries
 * no address to follow.
 */
export function plainQuotedText(text: string, max = 80): string {
	const plain = text
		.normalize('NFKC') // full-width letters become the ASCII a mail program would link
		.replace(/[\u3002\uff0e\uff61]/g, '.') // ideographic full stops separate domain labels (IDNA)
		// eslint-disable-next-line no-control-regex -- control characters are what this removes
		.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ')
		.replace(LINK_LIKE, '[link removed]')
		.replace(/"/g, "'")
		.replace(/\s+/g, ' ')
		.trim();
	return plain.length > max ? `${plain.slice(0, max - 1)}…` : plain;
}

/** Who did it: a person's name as plain quoted text, or their sign-in address (their identity) as it is. */
function personText(nameOrEmail: string): string {
	return /^[^\s@"<>]+@[^\s@"<>]+$/.test(nameOrEmail) ? nameOrEmail : plainQuotedText(nameOrEmail);
}

function minutesUntil(expires: Date, now = Date.now()): number {
	return Math.max(1, Math.round((expires.getTime() - now) / 60_000));
}

function layout(paragraphs: string[], link: { url: string; label: string }): string {
	const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('\n');
	return `<!doctype html><html><body style="font-family:sans-serif;line-height:1.5">
${body}
<p><a href="${escapeHtml(link.url)}">${escapeHtml(link.label)}</a></p>
<p style="color:#666;font-size:0.9em">${escapeHtml(link.url)}</p>
</body></html>`;
}

export function signInMail(to: string, url: string, expires: Date): OutgoingMail {
	const minutes = minutesUntil(expires);
	const lines = [
		'Here is your Framewright sign-in link.',
		`It works once and runs out in ${minutes} minutes.`,
		'If you did not ask for it, ignore this message: nobody can sign in without the link.'
	];
	return {
		to,
		subject: 'Your Framewright sign-in link',
		text: `${lines[0]}\n\n${url}\n\n${lines.slice(1).join('\n')}\n`,
		html: layout(lines, { url, label: 'Sign in to Framewright' })
	};
}

export function invitationMail(args: {
	to: string;
	url: string;
	workspaceName: string;
	role: string;
	invitedBy: string;
	expires: Date;
}): OutgoingMail {
	const workspace = plainQuotedText(args.workspaceName);
	const lines = [
		`${personText(args.invitedBy)} invited you to the Framewright workspace "${workspace}" as ${args.role}.`,
		`Open the link, sign in with this address (${args.to}) and accept. It runs out on ${args.expires.toISOString().slice(0, 10)}.`
	];
	return {
		to: args.to,
		subject: `Invitation to the workspace "${workspace}"`,
		text: `${lines.join('\n\n')}\n\n${args.url}\n`,
		html: layout(lines, { url: args.url, label: 'Open the invitation' })
	};
}

export function revisionPublishedMail(args: {
	to: string;
	url: string;
	mapName: string;
	revision: number;
	note: string;
	publishedBy: string;
	workspaceName: string;
}): OutgoingMail {
	const mapName = plainQuotedText(args.mapName);
	const lines = [
		`${personText(args.publishedBy)} published r${args.revision} of the map "${mapName}" in the workspace "${plainQuotedText(args.workspaceName)}".`,
		`Note: ${plainQuotedText(args.note, 2000)}`,
		'Decode with this revision only when it matches the firmware of the device you are working on.'
	];
	return {
		to: args.to,
		subject: `r${args.revision} of "${mapName}" published`,
		text: `${lines.join('\n\n')}\n\n${args.url}\n`,
		html: layout(lines, { url: args.url, label: `Open r${args.revision}` })
	};
}
