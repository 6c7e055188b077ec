import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from './client';

/**
 * Runs a query and hands its rows back as one JSON array built by the database. Thousands of
 * rows cross from embedded PGlite far faster as one text value than as rows of many columns
 * (each column of each row is decoded in JavaScript), and node-postgres is no slower.
 * JSON types: date as 'YYYY-MM-DD', timestamptz as an ISO string with offset, numbers as numbers.
 * `orderBy` names columns of the query's output; without it the order is not defined.
 */
export async function jsonRows<T>(db: DbOrTx, query: SQL, orderBy?: SQL): Promise<T[]> {
  return aggregate<T>(db, sql`json_agg(q${orderBy ? sql` order by ${orderBy}` : sql``})`, query);
}

/** As jsonRows, for a query whose column `a` is a json_build_array(…): smaller than objects. */
export async function jsonTuples<T extends unknown[]>(db: DbOrTx, query: SQL, orderBy?: SQL): Promise<T[]> {
  return aggregate<T>(db, sql`json_agg(q.a${orderBy ? sql` order by ${orderBy}` : sql``})`, query);
}

/**
 * Ids as one uuid[] parameter, for `= any(…)`: thousands of ids cost one parameter, not thousands.
 * Only for ids the database itself handed out (UUIDs need no quoting inside an array literal).
 */
export const uuidArray = (ids: readonly string[]) => sql`${`{${ids.join(',')}}`}::uuid[]`;

/** Values for `in (…)`, one parameter each. An empty list matches nothing. */
export const sqlList = (values: readonly string[]) => (values.length ? sql.join(values.map((v) => sql`${v}`), sql`, `) : sql`null`);

async function aggregate<T>(db: DbOrTx, agg: SQL, query: SQL): Promise<T[]> {
  const { rows } = (await db.execute(sql`select coalesce(${agg}, '[]')::text as v from (${query}) q`)) as unknown as { rows: { v: string }[] };
  return JSON.parse(rows[0].v) as T[];
}
