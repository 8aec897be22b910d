import type { Knex } from 'knex';
import { STAGE_KEYS } from '@trabeate/contracts';
import { DEMO } from '../../../seeds/demo';

/**
 * A busier firm for bench:api, on top of the demo: `count` more projects (invented references
 * BQ-0001…, split between the two demo clients, a tenth archived) with their six stages in
 * varied states, the demo engineer on every third one, and `activity` log entries on the first.
 * Returns the id of the project with the long activity log.
 */
export async function addBenchProjects(db: Knex, count: number, activity: number): Promise<string> {
  const firmId = DEMO.firm.id;
  const clients = [DEMO.clients.fenwick.id, DEMO.clients.harbourlight.id];
  const states = ['approved', 'approved', 'in_progress', 'under_review', 'not_started', 'not_started'];
  return db.transaction(async (trx) => {
    const rows = Array.from({ length: count }, (_, i) => ({
      firm_id: firmId,
      reference: `BQ-${String(i + 1).padStart(4, '0')}`,
      name: `Bench block ${i + 1} on Corrow Street`,
      client_organisation_id: clients[i % 2],
      site_address: `${(i % 90) + 1} Corrow Street, Vellmarsh`,
      building_use: i % 3 ? 'residential' : 'office',
      storeys: 2 + (i % 9),
      archived_at: i % 10 === 9 ? trx.fn.now() : null,
      updated_at: trx.raw(`now() - make_interval(mins => ?)`, [i * 7]),
    }));
    const ids: string[] = [];
    for (let i = 0; i < rows.length; i += 100) {
      const inserted = await trx('projects')
        .insert(rows.slice(i, i + 100))
        .returning('id');
      ids.push(...inserted.map((r: { id: string }) => r.id));
    }
    // Projects get their six stages from the app's own create path in real use; here, directly.
    const stages = ids.flatMap((projectId, i) =>
      STAGE_KEYS.map((key, position) => ({
        project_id: projectId,
        key,
        position: position + 1,
        state: states[(position + (i % 3)) % states.length],
        due_date: trx.raw(`current_date + ?::int`, [(position - 2) * 20 + (i % 15)]),
      })),
    );
    await trx('stages')
      .where((q) => q.whereIn('project_id', ids))
      .del();
    for (let i = 0; i < stages.length; i += 600) await trx('stages').insert(stages.slice(i, i + 600));
    const members = ids
      .filter((_, i) => i % 3 === 0)
      .map((projectId) => ({ project_id: projectId, user_id: DEMO.users.engineerA.id }));
    await trx('project_members').insert(members).onConflict(['project_id', 'user_id']).ignore();
    const entries = Array.from({ length: activity }, (_, i) => ({
      firm_id: firmId,
      project_id: ids[0],
      actor_id: i % 2 ? DEMO.users.principal.id : DEMO.users.engineerA.id,
      action: 'stage.commented',
      object_type: 'comment',
      object_id: String(i),
      stage_key: STAGE_KEYS[i % STAGE_KEYS.length],
      summary: `Bench note ${i + 1} on the framing`,
      at: trx.raw(`now() - make_interval(mins => ?)`, [i]),
    }));
    for (let i = 0; i < entries.length; i += 500) await trx('activity').insert(entries.slice(i, i + 500));
    return ids[0];
  });
}
