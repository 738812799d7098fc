import type { QueryInterface } from 'sequelize'

/**
 * The queue's full-text search reads one document per case: its title and description (as `search`)
 * and the text of all its messages. `messages_search` holds the messages' part, kept by statement-level
 * triggers on messages (a bulk insert updates each case once); `search_all` is generated from both, so
 * the queue can test a case with one `@@` on its own row while it walks an ordered index
 * (server/data/queue.ts), or read the few matches of a rare term from one GIN index.
 * Raw SQL: QueryInterface cannot say generated columns, functions or triggers.
 */
const DOC = `setweight(to_tsvector('english', coalesce(title, '')), 'A') || setweight(to_tsvector('english', coalesce(description, '')), 'B')`
/** The messages' part of one case's document, in the order they were written. */
const MESSAGES_OF = (caseId: string) => `(SELECT to_tsvector('english', string_agg(m.body, ' ' ORDER BY m.created_at, m.id)) FROM messages m WHERE m.case_id = ${caseId})`

const statements = [
  'ALTER TABLE cases ADD COLUMN messages_search tsvector',
  `ALTER TABLE cases ADD COLUMN search_all tsvector GENERATED ALWAYS AS (${DOC} || coalesce(messages_search, ''::tsvector)) STORED`,
  `UPDATE cases c SET messages_search = ${MESSAGES_OF('c.id')} WHERE EXISTS (SELECT 1 FROM messages m WHERE m.case_id = c.id)`,
  `CREATE FUNCTION rw_case_messages_added() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = coalesce(c.messages_search, ''::tsvector) || x.doc
    FROM (SELECT case_id, to_tsvector('english', string_agg(body, ' ' ORDER BY created_at, id)) AS doc FROM added GROUP BY case_id) x
   WHERE c.id = x.case_id;
  RETURN NULL;
END $$`,
  `CREATE FUNCTION rw_case_messages_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = ${MESSAGES_OF('c.id')}
   WHERE c.id IN (SELECT case_id FROM gone UNION SELECT case_id FROM now_rows);
  RETURN NULL;
END $$`,
  `CREATE FUNCTION rw_case_messages_removed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE cases c SET messages_search = ${MESSAGES_OF('c.id')} WHERE c.id IN (SELECT case_id FROM gone);
  RETURN NULL;
END $$`,
  'CREATE TRIGGER messages_search_added AFTER INSERT ON messages REFERENCING NEW TABLE AS added FOR EACH STATEMENT EXECUTE FUNCTION rw_case_messages_added()',
  'CREATE TRIGGER messages_search_changed AFTER UPDATE ON messages REFERENCING OLD TABLE AS gone NEW TABLE AS now_rows FOR EACH STATEMENT EXECUTE FUNCTION rw_case_messages_changed()',
  'CREATE TRIGGER messages_search_removed AFTER DELETE ON messages REFERENCING OLD TABLE AS gone FOR EACH STATEMENT EXECUTE FUNCTION rw_case_messages_removed()',
  'CREATE INDEX cases_search_all ON cases USING gin (search_all)',
]

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const s of statements) await q.sequelize.query(s)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TRIGGER IF EXISTS messages_search_removed ON messages; DROP TRIGGER IF EXISTS messages_search_changed ON messages; DROP TRIGGER IF EXISTS messages_search_added ON messages')
  await q.sequelize.query('DROP FUNCTION IF EXISTS rw_case_messages_removed(); DROP FUNCTION IF EXISTS rw_case_messages_changed(); DROP FUNCTION IF EXISTS rw_case_messages_added()')
  await q.sequelize.query('ALTER TABLE cases DROP COLUMN search_all, DROP COLUMN messages_search')
}
