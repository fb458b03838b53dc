/**
 * Audit entries in words: "Alex published r3 of Club racer ECU", on the server, for the audit log
 * page (which also gets the kinds to filter by from here). One line per kind of entry
 * (the dotted verbs `appendAudit` records); a kind this page does not know yet still reads as
 * who did what to which target.
 */
import type { PersonRef } from '$lib/api/shapes';
import { ROLE_LABELS, roleSchema } from '$lib/roles';
import type { AuditRecord } from '$lib/server/workspaces/audit-log';

/** The kinds an owner can filter by: each subject (every verb of it) and its verbs. */
export const AUDIT_KINDS: { subject: string; label: string; verbs: Record<string, string> }[] = [
	{
		subject: 'workspace',
		label: 'Workspace',
		verbs: { 'workspace.create': 'Created', 'workspace.rename': 'Renamed' }
	},
	{
		subject: 'invitation',
		label: 'Invitations',
		verbs: {
			'invitation.create': 'Sent',
			'invitation.revoke': 'Revoked',
			'invitation.accept': 'Accepted'
		}
	},
	{
		subject: 'member',
		label: 'Members',
		verbs: {
			'member.role_change': 'Role changed',
			'member.remove': 'Removed',
			'member.leave': 'Left'
		}
	},
	{
		subject: 'map',
		label: 'Maps',
		verbs: {
			'map.create': 'Created',
			'map.rename': 'Renamed',
			'map.bitrate': 'Bit rate set',
			'map.draft.save': 'Draft saved',
			'map.frame.define': 'Frame defined from a capture',
			'map.publish': 'Published',
			'map.restore': 'Revision restored',
			'map.delete': 'Deleted'
		}
	},
	{
		subject: 'share_link',
		label: 'Share links',
		verbs: { 'share_link.create': 'Created', 'share_link.revoke': 'Revoked' }
	},
	{
		subject: 'capture',
		label: 'Captures',
		verbs: {
			'capture.upload': 'Uploaded',
			'capture.process': 'Processed',
			'capture.reprocess': 'Read again',
			'capture.decode': 'Decoded',
			'capture.bitrate': 'Bit rate set',
			'capture.delete': 'Deleted'
		}
	}
];

const text = (value: unknown): string | null =>
	typeof value === 'string' || typeof value === 'number' ? String(value) : null;
const person = (p: PersonRef | null, fallback: string) => (p ? (p.name ?? p.email) : fallback);
const role = (value: unknown) => {
	const parsed = roleSchema.safeParse(value);
	return parsed.success ? ROLE_LABELS[parsed.data] : 'an unknown role';
};
const kbits = (value: unknown) =>
	typeof value === 'number' ? `${value / 1000} kbit/s` : 'an unknown rate';

/** The sentence for one entry, without its time. */
export function describeEntry(entry: AuditRecord): string {
	const who = person(entry.actor, 'A former member');
	const d = entry.details;
	// A map or capture deleted since is named as the entry recorded it, if it did.
	const map = entry.mapName ?? text(d.name) ?? 'a deleted map';
	const capture = entry.captureName ?? text(d.name) ?? text(d.fileName) ?? 'a deleted capture';
	const member = person(entry.subject, 'a former member');
	const revision = text(d.revision);
	switch (entry.action) {
		case 'workspace.create':
			return `${who} created the workspace ${text(d.name) ?? ''}`.trim();
		case 'workspace.rename':
			return `${who} renamed the workspace from “${text(d.from)}” to “${text(d.to)}”`;
		case 'workspace.delete':
			return `${who} deleted the workspace ${text(d.name) ?? ''}`.trim();
		case 'invitation.create':
			return `${who} invited ${entry.target} as ${role(d.role)}`;
		case 'invitation.revoke':
			return `${who} revoked the invitation for ${entry.target}`;
		case 'invitation.accept':
			return `${who} accepted the invitation and joined as ${role(d.role)}`;
		case 'member.role_change':
			return `${who} made ${member} ${role(d.to)} (was ${role(d.from)})`;
		case 'member.remove':
			return `${who} removed ${member} (${role(d.role)})`;
		case 'member.leave':
			return `${who} left the workspace`;
		case 'map.create': {
			const source =
				d.source === 'json' ? ' from a map file' : d.source === 'csv' ? ' from a signal table' : '';
			return `${who} created the map ${map}${source}`;
		}
		case 'map.rename':
			return `${who} renamed the map “${text(d.from)}” to “${text(d.to)}”`;
		case 'map.bitrate':
			return `${who} set the bit rate of ${map} to ${kbits(d.to)} (was ${kbits(d.from)})`;
		case 'map.draft.save':
			return `${who} saved the draft of ${map}`;
		case 'map.frame.define':
			return `${who} added the frame ${text(d.frame) ?? ''} to the draft of ${map} from a capture`;
		case 'map.publish':
			return `${who} published r${revision} of ${map}`;
		case 'map.restore':
			return `${who} restored r${revision} into the draft of ${map}`;
		case 'map.delete':
			return `${who} deleted the map ${map}`;
		case 'share_link.create':
			return `${who} shared r${revision} of ${map} by link${d.expiresAt ? ` until ${text(d.expiresAt)?.slice(0, 10)}` : ''}`;
		case 'share_link.revoke':
			return `${who} revoked a share link of ${map}`;
		case 'capture.upload':
			return `${who} uploaded the capture ${capture}`;
		case 'capture.process':
			return `${who} processed the capture ${capture}`;
		case 'capture.reprocess':
			return `${who} read the capture ${capture} again with another layout`;
		case 'capture.decode': {
			const with_ = d.revision === 'draft' ? 'the draft of' : `r${revision} of`;
			return `${who} decoded the capture ${capture} with ${with_} ${map}`;
		}
		case 'capture.bitrate': {
			const was = d.from === null || d.from === undefined ? 'a guess' : kbits(d.from);
			const data = typeof d.dataTo === 'number' ? `, data phase ${kbits(d.dataTo)}` : '';
			return `${who} set the bit rate of the capture ${capture} to ${kbits(d.to)}${data} (was ${was})`;
		}
		case 'capture.delete':
			return `${who} deleted the capture ${capture}`;
		default:
			return `${who}: ${entry.action}${entry.target ? ` (${entry.target})` : ''}`;
	}
}

// Times are shown in UTC, the same on the server's first paint and in every browser.
const TIME = new Intl.DateTimeFormat('en-GB', {
	day: 'numeric',
	month: 'short',
	year: 'numeric',
	hour: '2-digit',
	minute: '2-digit',
	hourCycle: 'h23',
	timeZone: 'UTC'
});

/** `2 Dec 2026 14:02` (UTC). */
export function entryTime(iso: string): string {
	const parts = Object.fromEntries(TIME.formatToParts(new Date(iso)).map((p) => [p.type, p.value]));
	return `${parts.day} ${parts.month} ${parts.year} ${parts.hour}:${parts.minute}`;
}
