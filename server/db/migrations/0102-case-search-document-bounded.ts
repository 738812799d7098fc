import type { QueryInterface } from 'sequelize'

/**
 * A tsvector must stay under 1 MB (PostgreSQL 15 manual, 8.11.1 "tsvector", and Appendix K limits: "string
 * is too long for tsvector"). The case document of migration 0101 grows with every message, so a long
 * thread of pasted measurement tables (each number its own lexeme) could reach the limit, and from then
 * on every new message, edit or case update of that case would fail. The triggers now keep the messages'
 * part under MAX bytes (room for the title and description beside it in the generated search_all): what
 * would take it past is left out of the search, never out of the thread. The set-based update stays the
 * common path; only when it fails on the limit are the cases taken one by one.
 * Raw SQL: QueryInterface cannot say functions.
 */
const MAX = 786_432
const MESSAGES_OF = (caseId: string) => `(SELECT to_tsvector('english', string_agg(m.body, ' ' ORDER BY m.created_at, m.id)) FROM messages m WHERE m.case_id = ${caseId})`

/**
 * Sets messages_search from `docs` (a SELECT of id, doc), where the result fits; when that fails on the
 * limit, case by case (`ids`, `perCase` the document of case r.id).
 */
const bounded = (docs: string, ids: string, perCase: string) => `
BEGIN
  BEGIN
    UPDATE cases c SET messages_search = d.doc
      FROM (${docs}) d
     WHERE c.id = d.id AND (d.doc IS NULL OR pg_column_size(d.doc) <= ${MAX});
  EXCEPTION WHEN program_limit_exceeded THEN
    FOR r IN SELECT id FROM cases WHERE id IN (${ids}) LOOP
      BEGIN
        UPDATE cases c SET messages_search = d.doc
          FROM (SELECT ${perCase} AS doc) d
         WHERE c.id = r.id AND (d.doc IS NULL OR pg_column_size(d.doc) <= ${MAX});
      EXCEPTION WHEN program_limit_exceeded THEN
        NULL; -- this case's document is full: the new words are not searched
      END;
    END LOOP;
  END;
  RETURN NULL;
END`

/** The added messages' documents, one per case, joined to what the case had (set-based: one pass over `added`). */
const ADDED_DOCS = `SELECT x.case_id AS id, coalesce(c2.messages_search, ''::tsvector) || x.doc AS doc
  FROM (SELECT case_id, to_tsvector('english', string_agg(body, ' ' ORDER BY created_at, id)) AS doc FROM added GROUP BY case_id) x
  JOIN cases c2 ON c2.id = x.case_id`
const ALL_DOCS = (ids: string) => `SELECT c2.id, ${MESSAGES_OF('c2.id')} AS doc FROM cases c2 WHERE c2.id IN (${ids})`
const ADDED_OF = (caseId: string) => `coalesce((SELECT messages_search FROM cases WHERE id = ${caseId}), ''::tsvector) || (SELECT to_tsvector('english', string_agg(body, ' ' ORDER BY created_at, id)) FROM added WHERE case_id = ${caseId})`

const functions = (mode: 'bounded' | 'plain') => [
  mode === 'bounded'
    ? `CREATE OR REPLACE FUNCTION rw_case_messages_added() RETURNS trigger LANGUAGE plpgsql AS $$ DECLARE r record; ${bounded(ADDED_DOCS, 'SELECT case_id FROM added', ADDED_OF('r.id'))} $$`
    : `CREATE OR REPLACE FUNCTION rw_case_messages_added() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = coalesce(c.messages_search, ''::tsvector) || x.doc
    FROM (SELECT case_id, to_tsvector('english', string_agg(body, ' ' ORDER BY created_at, id)) AS doc FROM added GROUP BY case_id) x
   WHERE c.id = x.case_id;
  RETURN NULL;
END $$`,
  mode === 'bounded'
    ? `CREATE OR REPLACE FUNCTION rw_case_messages_changed() RETURNS trigger LANGUAGE plpgsql AS $$ DECLARE r record; ${bounded(ALL_DOCS('SELECT case_id FROM gone UNION SELECT case_id FROM now_rows'), 'SELECT case_id FROM gone UNION SELECT case_id FROM now_rows', MESSAGES_OF('r.id'))} $$`
    : `CREATE OR REPLACE FUNCTION rw_case_messages_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = ${MESSAGES_OF('c.id')}
   WHERE c.id IN (SELECT case_id FROM gone UNION SELECT case_id FROM now_rows);
  RETURN NULL;
END $$`,
  mode === 'bounded'
    ? `CREATE OR REPLACE FUNCTION rw_case_messages_removed() RETURNS trigger LANGUAGE plpgsql AS $$ DECLARE r record; ${bounded(ALL_DOCS('SELECT case_id FROM gone'), 'SELECT case_id FROM gone', MESSAGES_OF('r.id'))} $$`
    : `CREATE OR REPLACE FUNCTION rw_case_messages_removed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = ${MESSAGES_OF('c.id')} WHERE c.id IN (SELECT case_id FROM gone);
  RETURN NULL;
END $$`,
]

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const s of functions('bounded')) await q.sequelize.query(s)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const s of functions('plain')) await q.sequelize.query(s)
}
