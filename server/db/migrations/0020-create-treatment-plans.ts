import type { QueryInterface } from 'sequelize'

/**
 * Treatment plans: numbered versions per case. A saved version never changes (a trigger refuses any
 * update of its content); sending it only stamps sent_at / sent_by, once.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE treatment_plans (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      case_id uuid NOT NULL REFERENCES cases(id) ON DELETE CASCADE,
      version integer NOT NULL CHECK (version > 0),
      room_id uuid NOT NULL REFERENCES rooms(id) ON DELETE RESTRICT,
      room_revision integer NOT NULL,
      body jsonb NOT NULL,
      predictions jsonb NOT NULL,
      engine_version varchar(40) NOT NULL,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      sent_at timestamptz,
      sent_by uuid REFERENCES users(id) ON DELETE SET NULL,
      UNIQUE (case_id, version)
    );
    CREATE INDEX treatment_plans_case ON treatment_plans (case_id, version DESC);

    CREATE FUNCTION treatment_plans_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.case_id IS DISTINCT FROM OLD.case_id OR NEW.version IS DISTINCT FROM OLD.version
         OR NEW.room_id IS DISTINCT FROM OLD.room_id OR NEW.room_revision IS DISTINCT FROM OLD.room_revision
         OR NEW.body IS DISTINCT FROM OLD.body OR NEW.predictions IS DISTINCT FROM OLD.predictions
         OR NEW.engine_version IS DISTINCT FROM OLD.engine_version OR NEW.created_at IS DISTINCT FROM OLD.created_at THEN
        RAISE EXCEPTION 'a saved plan version cannot be changed; save a new version instead';
      END IF;
      IF OLD.sent_at IS NOT NULL AND NEW.sent_at IS DISTINCT FROM OLD.sent_at THEN
        RAISE EXCEPTION 'this plan version was already sent';
      END IF;
      RETURN NEW;
    END $$;
    CREATE TRIGGER treatment_plans_immutable BEFORE UPDATE ON treatment_plans FOR EACH ROW EXECUTE FUNCTION treatment_plans_immutable();
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    DROP TRIGGER treatment_plans_immutable ON treatment_plans;
    DROP FUNCTION treatment_plans_immutable();
    DROP TABLE treatment_plans;
  `)
}
