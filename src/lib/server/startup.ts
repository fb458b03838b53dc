import { randomBytes } from 'node:crypto';
import { configureCaptureWorkers, startCaptureWorkers } from './captures/pool';
import { failInterruptedProcessing } from './captures/processing';
import { sweepStorage } from './captures/sweep';
import { loadConfig } from './config';
import { getDatabase, type DB } from './db';
import { createSendMail, type SendMail } from './mail/send';
import { startStandInSmtp, type StandInSmtp } from './mail/standin-smtp';
import type { Services } from './services';
import { storageFromEnv } from './storage';

async function startStandIn(db: DB, port: number): Promise<StandInSmtp> {
	try {
		return await startStandInSmtp(db, port);
	} catch (error) {
		// Only our own sendMail talks to it, so any free port will do when the usual one is taken.
		if ((error as NodeJS.ErrnoException).code !== 'EADDRINUSE') throw error;
		return startStandInSmtp(db, 0);
	}
}

// The demo seed is not started here: `db/demo-start.ts` runs before the server (scripts/serve.js,
// `npm run dev`), so nothing in src imports the demo scenario.
async function createServices(): Promise<Services> {
	const config = loadConfig();
	const db = await getDatabase();
	// Room for a processed frame store next to an upload at the limit (it is smaller in practice).
	const storage = storageFromEnv(process.env, 4 * config.captureMaxBytes);
	configureCaptureWorkers(config.captureWorkers);
	startCaptureWorkers();
	await failInterruptedProcessing(db, storage);
	sweepStorage(storage);
	let sendMail: SendMail;
	if (config.smtp) {
		sendMail = createSendMail(config.smtp, config.mailFrom);
	} else {
		const standIn = await startStandIn(db, config.standInSmtpPort);
		console.log(
			`Framewright demo mode: e-mail goes to the stand-in SMTP server on 127.0.0.1:${standIn.port}; read it at /dev/mailbox`
		);
		sendMail = createSendMail(
			{ host: '127.0.0.1', port: standIn.port, plain: true },
			config.mailFrom
		);
	}
	let secret = process.env.AUTH_SECRET;
	if (!secret && config.demoMode) {
		// scripts/serve.js persists a secret; this covers `vite dev`, where sessions may end on restart.
		secret = randomBytes(32).toString('base64url');
	}
	return { db, config, sendMail, secret, storage };
}

// Kept on globalThis so Vite's module reloading in development does not start a second SMTP server.
const key = Symbol.for('framewright.services');
type Holder = { [key]?: Promise<Services> };

/** Opens and migrates the database and starts mail, once per process. */
export function getServices(): Promise<Services> {
	const holder = globalThis as Holder;
	holder[key] ??= createServices().catch((error: unknown) => {
		delete holder[key];
		throw error;
	});
	return holder[key];
}
