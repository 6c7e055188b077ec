import type { BulkTarget } from './bulk-load';

/**
 * Bulk loading into indexed tables maintains every index row by row; building an index once at the
 * end is several times faster (PostgreSQL manual, "Populating a Database"). The secondary indexes
 * of the big tables are dropped and rebuilt from their own definitions, and foreign-key triggers are
 * off during the load; the references are then checked in one anti-join per key instead.
 */
export async function withFastLoad(target: BulkTarget, tables: string[], load: () => Promise<void>) {
  const list = tables.map((t) => `'${t}'`).join(', ');
  const indexes = await target.rows<{ indexname: string; indexdef: string }>(
    `select i.indexname, i.indexdef from pg_indexes i
      where i.schemaname = 'public' and i.tablename in (${list})
        and not exists (select 1 from pg_constraint c where c.conname = i.indexname)`,
  );
  const fks = await target.rows<{ child: string; parent: string; fk: string; pk: string }>(
    `select c.conrelid::regclass::text as child, c.confrelid::regclass::text as parent,
            a.attname as fk, p.attname as pk
       from pg_constraint c
       join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
       join pg_attribute p on p.attrelid = c.confrelid and p.attnum = c.confkey[1]
      where c.contype = 'f' and c.conrelid::regclass::text in (${list})`,
  );
  for (const i of indexes) await target.exec(`DROP INDEX "${i.indexname}"`);
  let triggersOff = true;
  await target.exec('SAVEPOINT fast_load');
  try {
    await target.exec('SET LOCAL session_replication_role = replica');
    await target.exec('RELEASE SAVEPOINT fast_load');
  } catch {
    // Not allowed for this PostgreSQL role: the foreign keys are then checked row by row.
    await target.exec('ROLLBACK TO SAVEPOINT fast_load');
    triggersOff = false;
  }
  await load();
  if (triggersOff) await target.exec('SET LOCAL session_replication_role = origin');
  for (const i of indexes) await target.exec(i.indexdef);
  if (!triggersOff) return;
  for (const f of fks) {
    const [{ n }] = await target.rows<{ n: number }>(
      `select count(*)::int as n from ${f.child} c where c.${f.fk} is not null
         and not exists (select 1 from ${f.parent} p where p.${f.pk} = c.${f.fk})`,
    );
    if (n > 0) throw new Error(`${n} rows of ${f.child}.${f.fk} point at no row of ${f.parent}.`);
  }
}
