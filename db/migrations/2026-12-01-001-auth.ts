import type { Kysely } from 'kysely';

// The four tables @auth/kysely-adapter reads and writes, with its exact (PascalCase table, camelCase
// column) names — see node_modules/@auth/kysely-adapter/index.js. Dates are ISO text: the adapter turns
// Date objects into ISO strings on SQLite.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('User')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('name', 'text')
		.addColumn('email', 'text', (c) => c.notNull().unique())
		.addColumn('emailVerified', 'text')
		.addColumn('image', 'text')
		.execute();

	await db.schema
		.createTable('Account')
		.addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
		.addColumn('userId', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('type', 'text', (c) => c.notNull())
		.addColumn('provider', 'text', (c) => c.notNull())
		.addColumn('providerAccountId', 'text', (c) => c.notNull())
		.addColumn('refresh_token', 'text')
		.addColumn('access_token', 'text')
		.addColumn('expires_at', 'integer')
		.addColumn('token_type', 'text')
		.addColumn('scope', 'text')
		.addColumn('id_token', 'text')
		.addColumn('session_state', 'text')
		.addUniqueConstraint('Account_provider_account_unique', ['provider', 'providerAccountId'])
		.execute();
	await db.schema.createIndex('Account_userId_index').on('Account').column('userId').execute();

	await db.schema
		.createTable('Session')
		.addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
		.addColumn('sessionToken', 'text', (c) => c.notNull().unique())
		.addColumn('userId', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('expires', 'text', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('Session_userId_index').on('Session').column('userId').execute();

	await db.schema
		.createTable('VerificationToken')
		.addColumn('identifier', 'text', (c) => c.notNull())
		.addColumn('token', 'text', (c) => c.notNull().unique())
		.addColumn('expires', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('VerificationToken_pk', ['identifier', 'token'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('VerificationToken').execute();
	await db.schema.dropTable('Session').execute();
	await db.schema.dropTable('Account').execute();
	await db.schema.dropTable('User').execute();
}
