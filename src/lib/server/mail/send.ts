import { createTransport } from 'nodemailer';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

export type SendMail = (message: OutgoingMail) => Promise<void>;

export interface SmtpTarget {
	host: string;
	port: number;
	user?: string;
	pass?: string;
	/** The local stand-in server speaks plain SMTP only. */
	plain?: boolean;
}

/** The one way the app sends e-mail (sign-in links, invitations), over SMTP to a real or stand-in server. */
export function createSendMail(target: SmtpTarget, from: string): SendMail {
	const transport = createTransport({
		host: target.host,
		port: target.port,
		// Port 465 is implicit TLS; others upgrade with STARTTLS when offered (RFC 8314, common practice).
		secure: target.port === 465,
		ignoreTLS: target.plain ?? false,
		auth: target.user ? { user: target.user, pass: target.pass ?? '' } : undefined
	});
	return async (message) => {
		const result = await transport.sendMail({ from, ...message });
		if (result.rejected.length > 0) {
			throw new Error(`The mail server refused the message to ${message.to}.`);
		}
	};
}
