import { hash, verify, type Algorithm } from '@node-rs/argon2';
import type { Knex } from 'knex';

// argon2id with the memory and time costs OWASP's password storage guidance gives as a minimum
// (19 MiB, 2 passes, 1 lane).
// (Algorithm is a const enum, which isolated modules cannot read: 2 is its Argon2id.)
const ARGON2 = { algorithm: 2 as Algorithm.Argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export interface IdentityAccount {
  id: string;
  email: string;
  name: string;
}

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2);
}

// Checked against when the e-mail is unknown, so a wrong e-mail costs as long as a wrong password.
let dummyHash: Promise<string> | undefined;

/** The account when the e-mail and password match; undefined otherwise. */
export async function checkPassword(db: Knex, email: string, password: string): Promise<IdentityAccount | undefined> {
  const row = await db('identity_accounts')
    .whereRaw('lower(email) = lower(?)', [email.trim()])
    .first('id', 'email', 'name', 'password_hash');
  if (!row) {
    dummyHash ??= hashPassword('not-a-real-password');
    await verify(await dummyHash, password).catch(() => false);
    return undefined;
  }
  const ok = await verify(row.password_hash, password).catch(() => false);
  return ok ? { id: row.id, email: row.email, name: row.name } : undefined;
}

export async function findAccountById(db: Knex, id: string): Promise<IdentityAccount | undefined> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return undefined;
  return db('identity_accounts').where({ id }).first('id', 'email', 'name');
}

/** Creates the account or leaves an existing one with that e-mail as it is; safe to run again. */
export async function ensureAccount(
  db: Knex,
  account: { email: string; name: string; password: string },
): Promise<boolean> {
  const existing = await db('identity_accounts').whereRaw('lower(email) = lower(?)', [account.email]).first('id');
  if (existing) return false;
  await db('identity_accounts')
    .insert({ email: account.email, name: account.name, password_hash: await hashPassword(account.password) })
    .onConflict(db.raw('(lower(email))'))
    .ignore();
  return true;
}
