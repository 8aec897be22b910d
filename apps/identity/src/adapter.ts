import type { Knex } from 'knex';
import type { Adapter, AdapterPayload } from 'oidc-provider';

/**
 * oidc-provider's storage in PostgreSQL (table identity_payloads): one row per model and id, with
 * the expiry the provider asks for, so several provider processes could share it.
 */
export class PgAdapter implements Adapter {
  constructor(
    private readonly db: Knex,
    private readonly model: string,
  ) {}

  async upsert(id: string, payload: AdapterPayload, expiresIn?: number): Promise<void> {
    await this.db('identity_payloads')
      .insert({
        model: this.model,
        id,
        payload: JSON.stringify(payload),
        grant_id: payload.grantId ?? null,
        user_code: payload.userCode ?? null,
        uid: payload.uid ?? null,
        expires_at: expiresIn ? new Date(Date.now() + expiresIn * 1000) : null,
      })
      .onConflict(['model', 'id'])
      .merge();
  }

  find(id: string): Promise<AdapterPayload | undefined> {
    return this.findBy({ id });
  }

  findByUid(uid: string): Promise<AdapterPayload | undefined> {
    return this.findBy({ uid });
  }

  findByUserCode(userCode: string): Promise<AdapterPayload | undefined> {
    return this.findBy({ user_code: userCode });
  }

  async consume(id: string): Promise<void> {
    await this.db('identity_payloads').where({ model: this.model, id }).update({ consumed_at: this.db.fn.now() });
  }

  async destroy(id: string): Promise<void> {
    await this.db('identity_payloads').where({ model: this.model, id }).del();
  }

  async revokeByGrantId(grantId: string): Promise<void> {
    await this.db('identity_payloads').where({ grant_id: grantId }).del();
  }

  private async findBy(where: Record<string, string>): Promise<AdapterPayload | undefined> {
    const row = await this.db('identity_payloads')
      .where({ model: this.model, ...where })
      .andWhere((q) => q.whereNull('expires_at').orWhere('expires_at', '>', this.db.fn.now()))
      .first('payload', 'consumed_at');
    if (!row) return undefined;
    return {
      ...row.payload,
      ...(row.consumed_at ? { consumed: Math.floor(new Date(row.consumed_at).getTime() / 1000) } : {}),
    };
  }
}

/** Drops records past their expiry; run at start (a long-lived deployment would schedule it). */
export async function pruneExpired(db: Knex): Promise<number> {
  return db('identity_payloads').where('expires_at', '<', db.fn.now()).del();
}
