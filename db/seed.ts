import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import type { Kysely } from 'kysely';
import type { Database } from '../src/lib/server/db/schema';
import type { Role } from '../src/lib/roles';
import { appendAudit } from '../src/lib/server/workspaces/audit';
import { saveDraft } from '../src/lib/server/maps/drafts';
import { createMap, findMapForWorkspace } from '../src/lib/server/maps/maps';
import { publishRevision } from '../src/lib/server/maps/revisions';
import { parseMap } from '../src/lib/can/map-json';
import type { CanMap } from '../src/lib/can/map';
import type { BlobStorage } from '../src/lib/server/storage/storage';
import { importCaptureInProcess } from '../src/lib/server/captures/processing';
import { linkProfile } from '../src/lib/can/receivers/linking';
import { saveProfileDraft } from '../src/lib/server/receivers/drafts';
import { publishProfile } from '../src/lib/server/receivers/revisions';
import { requireRevision } from '../src/lib/server/maps/revisions';
import { createProfile, requireProfile } from '../src/lib/server/receivers/profiles';
import clubRacerMapJson from '../fixtures/club-racer-ecu.map.json';
import gensetMapJson from '../fixtures/genset-j1939.map.json';
import dashDisplayJson from '../fixtures/dash-display.profile.json';
import gensetPanelJson from '../fixtures/genset-panel.profile.json';

// An invented scenario for demos: a small club motorsport team. Addresses use the reserved `.test`
// top-level domain (RFC 2606), so no real mailbox can ever receive them.
export const demoWorkspace = {
	slug: 'quillmoor-club-racing',
	name: 'Quillmoor Club Racing'
} as const;

export const demoAccounts: { email: string; name: string; role: Role }[] = [
	{ email: 'owner@framewright.test', name: 'Team owner (demo)', role: 'owner' },
	{ email: 'calibrator@framewright.test', name: 'Calibrator (demo)', role: 'editor' },
	{ email: 'tuner@framewright.test', name: 'Tuner (demo)', role: 'viewer' }
];

export async function countUsers(db: Kysely<Database>): Promise<number> {
	const { n } = await db
		.selectFrom('User')
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.executeTakeFirstOrThrow();
	return Number(n);
}

/** Adds whatever part of the demo data is missing; running it again changes nothing. */
export interface SeedOptions {
	/** Where the demo captures go; without it they are not seeded. */
	storage?: BlobStorage;
}

export async function seedDemo(
	db: Kysely<Database>,
	options: SeedOptions = {}
): Promise<{ created: string[] }> {
	const { created, workspaceId, calibratorId } = await seedPeople(db);
	// The map repositories open their own transactions, so maps are added after the people.
	created.push(...(await seedDemoMaps(db, workspaceId, calibratorId)));
	created.push(...(await seedDemoReceivers(db, workspaceId, calibratorId)));
	if (options.storage) created.push(...(await seedDemoCaptures(db, options.storage, workspaceId)));
	return { created };
}

function fixtureMap(json: unknown, file: string): CanMap {
	const parsed = parseMap(json);
	if (!parsed.ok)
		throw new Error(
			`fixtures/${file} is not a valid map: ${parsed.problems.map((p) => `${p.path} ${p.message}`).join('; ')}`
		);
	return parsed.map;
}

/**
 * The two demo maps, only while the workspace has none: the club racer controller published as r1
 * with an unpublished change in its draft, and the generator set published as r1.
 */
async function seedDemoMaps(
	db: Kysely<Database>,
	workspaceId: string,
	actorId: string
): Promise<string[]> {
	const existing = await db
		.selectFrom('maps')
		.select('id')
		.where('workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (existing) return [];
	const clubRacer = fixtureMap(clubRacerMapJson, 'club-racer-ecu.map.json');
	const genset = fixtureMap(gensetMapJson, 'genset-j1939.map.json');

	const club = await createMap(db, { workspaceId, map: clubRacer, actorId, source: 'json' });
	await publishRevision(db, {
		workspaceId,
		mapId: club.id,
		version: 1,
		actorId,
		note: 'First release for the season: engine, pressures, drivetrain and chassis frames.'
	});
	const draft = structuredClone(clubRacer);
	for (const frame of draft.frames) {
		for (const signal of frame.signals) {
			if (signal.name === 'CoolantTemp') {
				signal.max = 110;
				signal.comment = 'Warning limit raised for summer events (not yet published).';
			}
		}
	}
	await saveDraft(db, { workspaceId, mapId: club.id, version: 1, draft, actorId });

	const gen = await createMap(db, { workspaceId, map: genset, actorId, source: 'json' });
	await publishRevision(db, {
		workspaceId,
		mapId: gen.id,
		version: 1,
		actorId,
		note: 'Generator set engine broadcast as installed on the demo unit.'
	});
	const found = await findMapForWorkspace(db, workspaceId, club.id);
	return [`map ${found?.name ?? club.name} (r1 + draft)`, `map ${gen.name} (r1)`];
}

/**
 * The two demo receivers, only while the workspace has none: the club racer's dash display and the
 * generator set's panel, each linked to r1 of its map — automatically, except the dash's knock
 * count, which its profile links by hand — and published as r1. Between them they show a unit
 * conversion (kPa → bar, °C → °F) and the λ → AFR rule (common practice).
 */
async function seedDemoReceivers(
	db: Kysely<Database>,
	workspaceId: string,
	actorId: string
): Promise<string[]> {
	const existing = await db
		.selectFrom('receiver_profiles')
		.select('id')
		.where('workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (existing) return [];
	const created: string[] = [];
	const pairs = [
		{ profile: dashDisplayJson, map: clubRacerMapJson.name },
		{ profile: gensetPanelJson, map: gensetMapJson.name }
	];
	for (const pair of pairs) {
		const map = await db
			.selectFrom('maps')
			.select('id')
			.where('workspace_id', '=', workspaceId)
			.where('name', '=', pair.map)
			.executeTakeFirst();
		if (!map) continue;
		const { profile: ref } = await createProfile(db, {
			workspaceId,
			actorId,
			request: { profileJson: JSON.stringify(pair.profile) }
		});
		const { draft } = await requireProfile(db, workspaceId, ref.id);
		const revision = await requireRevision(db, map.id, 1);
		const report = linkProfile(draft.profile, revision.map);
		await saveProfileDraft(db, {
			workspaceId,
			profileId: ref.id,
			version: 1,
			actorId,
			draft: {
				profile: draft.profile,
				target: { mapId: map.id, revision: 1 },
				links: report.links.map((l) => l.link)
			}
		});
		await publishProfile(db, {
			workspaceId,
			profileId: ref.id,
			version: 2,
			actorId,
			note: `Fitted to ${pair.map} r1: ${report.links.length} channels linked, ${report.unlinked.length} left for other senders.`
		});
		created.push(`receiver profile ${ref.name} (r1, ${report.links.length} links)`);
	}
	return created;
}

/** The two demo captures, uploaded by the tuner and processed, only while the workspace has none. */
async function seedDemoCaptures(
	db: Kysely<Database>,
	storage: BlobStorage,
	workspaceId: string
): Promise<string[]> {
	const existing = await db
		.selectFrom('captures')
		.select('id')
		.where('workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (existing) return [];
	const tuner = await db
		.selectFrom('User')
		.select('id')
		.where('email', '=', 'tuner@framewright.test')
		.executeTakeFirst();
	const created: string[] = [];
	for (const fileName of ['club-racer-session.csv', 'genset-idle.csv']) {
		// Read from the project folder, where the server, the CLI and the tests all run.
		const text = await readFile(resolve('fixtures', fileName), 'utf8');
		await importCaptureInProcess(
			{ db, storage },
			{ workspaceId, actorId: tuner?.id ?? null, fileName, text }
		);
		created.push(`capture ${fileName} (processed)`);
	}
	return created;
}

async function seedPeople(
	db: Kysely<Database>
): Promise<{ created: string[]; workspaceId: string; calibratorId: string }> {
	return db.transaction().execute(async (trx) => {
		const created: string[] = [];
		const now = new Date().toISOString();
		const userIds = new Map<string, string>();
		for (const account of demoAccounts) {
			const existing = await trx
				.selectFrom('User')
				.select('id')
				.where('email', '=', account.email)
				.executeTakeFirst();
			if (existing) {
				userIds.set(account.email, existing.id);
				continue;
			}
			const id = crypto.randomUUID();
			await trx
				.insertInto('User')
				.values({ id, email: account.email, name: account.name, emailVerified: null, image: null })
				.execute();
			userIds.set(account.email, id);
			created.push(`user ${account.email}`);
		}

		let workspace = await trx
			.selectFrom('workspaces')
			.select('id')
			.where('slug', '=', demoWorkspace.slug)
			.executeTakeFirst();
		if (!workspace) {
			workspace = { id: crypto.randomUUID() };
			await trx
				.insertInto('workspaces')
				.values({
					id: workspace.id,
					...demoWorkspace,
					created_by: userIds.get(demoAccounts[0].email) ?? null,
					created_at: now
				})
				.execute();
			created.push(`workspace ${demoWorkspace.slug}`);
		}

		for (const account of demoAccounts) {
			const result = await trx
				.insertInto('memberships')
				.values({
					workspace_id: workspace.id,
					user_id: userIds.get(account.email)!,
					role: account.role,
					joined_at: now
				})
				.onConflict((oc) => oc.columns(['workspace_id', 'user_id']).doNothing())
				.executeTakeFirst();
			if (Number(result.numInsertedOrUpdatedRows ?? 0) > 0)
				created.push(`membership ${account.email} (${account.role})`);
		}

		if (created.length > 0) {
			await appendAudit(trx, {
				workspaceId: workspace.id,
				actorId: null,
				action: 'demo.seed',
				target: demoWorkspace.slug,
				details: { created }
			});
		}
		return {
			created,
			workspaceId: workspace.id,
			calibratorId: userIds.get('calibrator@framewright.test')!
		};
	});
}
