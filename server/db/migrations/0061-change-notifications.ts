import type { QueryInterface } from 'sequelize'

/**
 * Change notifications for the in-process caches (server/db/change-feed.ts): triggers NOTIFY the channel
 * `rw_changes` at commit, whichever code or node made the change. Raw SQL: QueryInterface cannot say
 * functions or triggers.
 *   `u:<user id>`: an account row changed or went, or one of its sessions changed (not a mere expiry
 *   touch) or ended — the cached session and signed-in user of that account are dropped on every node.
 *   `q`: once per statement on the tables the queue shows; PostgreSQL folds equal payloads of one
 *   transaction into one notification.
 * Session ids never go on the channel (a listener learns only which account to forget).
 */
const statements = [
  `CREATE FUNCTION rw_notify_user_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('rw_changes', 'u:' || OLD.id);
  RETURN NULL;
END $$`,
  `CREATE FUNCTION rw_notify_session_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF OLD.user_id IS NOT NULL THEN PERFORM pg_notify('rw_changes', 'u:' || OLD.user_id); END IF;
  IF TG_OP = 'UPDATE' AND NEW.user_id IS NOT NULL AND NEW.user_id IS DISTINCT FROM OLD.user_id THEN
    PERFORM pg_notify('rw_changes', 'u:' || NEW.user_id);
  END IF;
  RETURN NULL;
END $$`,
  `CREATE FUNCTION rw_notify_queue_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('rw_changes', 'q');
  RETURN NULL;
END $$`,
  'CREATE TRIGGER users_changed AFTER UPDATE OR DELETE ON users FOR EACH ROW EXECUTE FUNCTION rw_notify_user_changed()',
  // an expiry touch leaves sess alone (json has no equality operator, hence the text comparison)
  `CREATE TRIGGER session_changed AFTER UPDATE ON "session" FOR EACH ROW WHEN (OLD.sess::text IS DISTINCT FROM NEW.sess::text) EXECUTE FUNCTION rw_notify_session_changed()`,
  'CREATE TRIGGER session_ended AFTER DELETE ON "session" FOR EACH ROW EXECUTE FUNCTION rw_notify_session_changed()',
  ...['cases', 'messages', 'users', 'rooms', 'room_revisions'].map(
    (t) => `CREATE TRIGGER ${t}_queue_changed AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${t} FOR EACH STATEMENT EXECUTE FUNCTION rw_notify_queue_changed()`,
  ),
]

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const s of statements) await q.sequelize.query(s)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const t of ['cases', 'messages', 'users', 'rooms', 'room_revisions']) await q.sequelize.query(`DROP TRIGGER IF EXISTS ${t}_queue_changed ON ${t}`)
  await q.sequelize.query('DROP TRIGGER IF EXISTS session_ended ON "session"; DROP TRIGGER IF EXISTS session_changed ON "session"; DROP TRIGGER IF EXISTS users_changed ON users')
  await q.sequelize.query('DROP FUNCTION IF EXISTS rw_notify_queue_changed(); DROP FUNCTION IF EXISTS rw_notify_session_changed(); DROP FUNCTION IF EXISTS rw_notify_user_changed()')
}
