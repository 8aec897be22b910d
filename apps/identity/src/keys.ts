import { generateKeyPairSync, randomBytes, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';

/**
 * The provider's signing key and cookie keys, generated at first start and kept in PostgreSQL so
 * restarts (and a second process) sign with the same key and read the same cookies.
 */
export async function loadSecrets(db: Knex): Promise<{ jwk: Record<string, unknown>; cookieKeys: string[] }> {
  const jwk = await loadOrCreate(db, 'signing-key', () => {
    const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
    return { ...privateKey.export({ format: 'jwk' }), kid: randomUUID(), alg: 'RS256', use: 'sig' };
  });
  const cookieKeys = await loadOrCreate(db, 'cookie-keys', () => [randomBytes(32).toString('hex')]);
  return { jwk: jwk as Record<string, unknown>, cookieKeys: cookieKeys as string[] };
}

async function loadOrCreate(db: Knex, name: string, create: () => unknown): Promise<unknown> {
  // Two processes starting together: the first insert wins and both read the same row.
  await db('identity_secrets')
    .insert({ name, value: JSON.stringify(create()) })
    .onConflict('name')
    .ignore();
  const row = await db('identity_secrets').where({ name }).first('value');
  return row.value;
}
