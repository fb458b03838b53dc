import type { DB } from './connection';

export async function findUserByEmail(db: DB, email: string) {
	return db
		.selectFrom('User')
		.selectAll()
		.where('email', '=', email.trim().toLowerCase())
		.executeTakeFirst();
}

export async function findUserById(db: DB, id: string) {
	return db.selectFrom('User').selectAll().where('id', '=', id).executeTakeFirst();
}
