import type { OutgoingMail } from './send';

function escapeHtml(text: string): string {
	return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
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
	const lines = [
		`${args.invitedBy} invited you to the Framewright workspace "${args.workspaceName}" as ${args.role}.`,
		`Open the link, sign in with this address (${args.to}) and accept. It runs out on ${args.expires.toISOString().slice(0, 10)}.`
	];
	return {
		to: args.to,
		subject: `Invitation to the workspace "${args.workspaceName}"`,
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
	const lines = [
		`${args.publishedBy} published r${args.revision} of the map "${args.mapName}" in the workspace "${args.workspaceName}".`,
		`Note: ${args.note}`,
		'Decode with this revision only when it matches the firmware of the device you are working on.'
	];
	return {
		to: args.to,
		subject: `r${args.revision} of ${args.mapName} published`,
		text: `${lines.join('\n\n')}\n\n${args.url}\n`,
		html: layout(lines, { url: args.url, label: `Open r${args.revision}` })
	};
}
