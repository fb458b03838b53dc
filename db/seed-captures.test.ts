// The demo seed's captures: both fixtures uploaded by the tuner and processed, once.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadWholeCapture } from '../src/lib/server/captures/capture-store';
import { createTestServices } from '../src/lib/server/test-support';
import { seedDemo } from './seed';

/** Data rows of a fixture, counted independently of the importer: non-blank lines after the header. */
const dataRows = (file: string) =>
	readFileSync(new URL(`../fixtures/${file}`, import.meta.url), 'utf8')
		.split('\n')
		.filter((l) => l.trim() !== '').length - 1;

describe('demo seed captures', () => {
	it('adds the two demo captures, processed and ready, uploaded by the tuner, and only once', async () => {
		const services = await createTestServices();
		const first = await seedDemo(services.db, { storage: services.storage });
		expect(first.created.filter((c) => c.startsWith('capture '))).toEqual([
			'capture club-racer-session.csv (processed)',
			'capture genset-idle.csv (processed)'
		]);
		const rows = await services.db
			.selectFrom('captures')
			.innerJoin('User', 'User.id', 'captures.uploaded_by')
			.select([
				'captures.id',
				'captures.name',
				'captures.status',
				'captures.frame_count',
				'captures.store_key',
				'User.email'
			])
			.orderBy('captures.name')
			.execute();
		expect(rows.map((r) => [r.name, r.status, r.frame_count, r.email])).toEqual([
			[
				'club-racer-session.csv',
				'ready',
				dataRows('club-racer-session.csv'),
				'tuner@framewright.test'
			],
			['genset-idle.csv', 'ready', dataRows('genset-idle.csv'), 'tuner@framewright.test']
		]);
		const store = await loadWholeCapture(services.storage, rows[0].store_key!);
		expect(store.count).toBe(dataRows('club-racer-session.csv'));
		const second = await seedDemo(services.db, { storage: services.storage });
		expect(second.created).toEqual([]);
	});
});
