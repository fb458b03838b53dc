import { randomBytes } from 'node:crypto';
import { closeCaptureWorkers, configureCaptureWorkers, startCaptureWorkers } from './captures/pool';
import { allProcessingDone, failInterruptedProcessing } from './captures/processing';
import { sweepStorage } from './captures/sweep';
import { loadConfig, startupProblem } from './config';
import { getDatabase, type DB } from './db';
import { createMailLimits } from './mail/limits';
import { createSendMail, type SendMail } from './mail/send';
import { startStandInSmtp, type StandInSmtp } from './mail/standin-smtp';
import type { Services } from './services';
import { onShutdown, shutdown } from './shutdown';
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
	const problem = startupProblem(config);
	if (problem) throw new Error(problem);
	const db = await getDatabase();
	// Closed last (closers run newest first): after processing and mail are done with it.
	onShutdown('database', () => db.destroy());
	// Room for a processed frame store next to an upload at the limit (it is smaller in practice).
	const storage = storageFromEnv(process.env, 4 * config.captureMaxBytes);
	configureCaptureWorkers(config.captureWorkers);
	startCaptureWorkers();
	onShutdown('capture processing', async () => {
		// Let running processing finish for a few seconds; what is still running is marked
		// interrupted (as a restart would), so nobody waits on it and it can be processed again.
		await Promise.race([allProcessingDone(), new Promise((r) => setTimeout(r, 3000))]);
		await failInterruptedProcessing(db, storage);
		await closeCaptureWorkers();
	});
	await failInterruptedProcessing(db, storage);
	sweepStorage(storage);
	let sendMail: SendMail;
	if (config.smtp) {
		sendMail = createSendMail(config.smtp, config.mailFrom);
	} else {
		const standIn = await startStandIn(db, config.standInSmtpPort);
		onShutdown('stand-in SMTP server', () => standIn.close());
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
	return { db, config, sendMail, secret, storage, mailLimits: createMailLimits(config) };
}

// Kept on globalThis so Vite's module reloading in development does not start a second SMTP server.
const key = Symbol.for('framewright.services');
type Holder = { [key]?: Promise<Services> };

/** adapter-node emits this once it has stopped accepting connections (SIGTERM, SIGINT). */
function closeOnServerShutdown(): void {
	const flag = Symbol.for('framewright.shutdown-listener');
	const holder = globalThis as { [flag]?: boolean };
	if (holder[flag]) return;
	holder[flag] = true;
	process.once('sveltekit:shutdown' as 'beforeExit', () => {
		void shutdown().then(() => console.log('Framewright stopped.'));
	});
}

/** Opens and migrates the database and starts mail, once per process. */
export function getServices(): Promise<Services> {
	closeOnServerShutdown();
	const holder = globalThis as Holder;
	holder[key] ??= createServices().catch((error: unknown) => {
		delete holder[key];
		throw error;
	});
	return holder[key];
}
