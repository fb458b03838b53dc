import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { DB } from '../db';
import { storeMailboxMessage } from './mailbox';

export interface StandInSmtp {
	port: number;
	close(): Promise<void>;
}

function addressText(address: AddressObject | AddressObject[] | undefined): string {
	if (!address) return '';
	const list = Array.isArray(address) ? address : [address];
	return list
		.flatMap((a) => a.value.map((v) => v.address ?? ''))
		.filter(Boolean)
		.join(', ');
}

/**
 * A local SMTP server for demo and development: it accepts any message without authentication
 * (it listens on 127.0.0.1 only) and files it in the mailbox_messages table, one row per recipient.
 * `port: 0` picks a free port.
 */
export async function startStandInSmtp(db: DB, port: number): Promise<StandInSmtp> {
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['AUTH', 'STARTTLS'],
		logger: false,
		banner: 'Framewright stand-in mail server (demo only)',
		onData(stream, session, callback) {
			simpleParser(stream)
				.then(async (mail) => {
					const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
					const recipients = envelopeTo.length > 0 ? envelopeTo : [addressText(mail.to)];
					for (const to of recipients) {
						await storeMailboxMessage(db, {
							to,
							from: addressText(mail.from),
							subject: mail.subject ?? '(no subject)',
							text: mail.text ?? '',
							html: typeof mail.html === 'string' ? mail.html : null
						});
					}
					callback();
				})
				.catch((error: unknown) =>
					callback(error instanceof Error ? error : new Error(String(error)))
				);
		}
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, '127.0.0.1', () => {
			server.off('error', reject);
			resolve();
		});
	});
	const address = server.server.address();
	const actualPort = typeof address === 'object' && address ? address.port : port;
	return {
		port: actualPort,
		close: () => new Promise<void>((resolve) => server.close(() => resolve()))
	};
}
