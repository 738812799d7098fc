import { DataTypes, Op, type QueryInterface } from 'sequelize'
import { desc, maybeAt, ref, required, stamp, uuidKey } from '../columns'

/**
 * Treatment plans: numbered versions per case. A saved version never changes (a trigger refuses any
 * update of its content); sending it only stamps sent_at / sent_by, once.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('treatment_plans', {
    id: uuidKey(),
    case_id: ref('cases', 'CASCADE', true),
    version: required(DataTypes.INTEGER),
    room_id: ref('rooms', 'RESTRICT', true),
    room_revision: required(DataTypes.INTEGER),
    body: required(DataTypes.JSONB),
    predictions: required(DataTypes.JSONB),
    engine_version: required(DataTypes.STRING(40)),
    created_by: ref('users', 'SET NULL'),
    created_at: stamp(),
    sent_at: maybeAt(),
    sent_by: ref('users', 'SET NULL'),
  })
  await q.addConstraint('treatment_plans', { type: 'check', name: 'treatment_plans_version_check', fields: ['version'], where: { version: { [Op.gt]: 0 } } })
  await q.addConstraint('treatment_plans', { type: 'unique', name: 'treatment_plans_case_id_version_key', fields: ['case_id', 'version'] })
  await q.addIndex('treatment_plans', { fields: ['case_id', desc('version')], name: 'treatment_plans_case' })

  // Raw SQL: QueryInterface cannot create a function or a trigger.
  await q.sequelize.query(`
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
  // Raw SQL: the trigger and its function (see up).
  await q.sequelize.query('DROP TRIGGER treatment_plans_immutable ON treatment_plans; DROP FUNCTION treatment_plans_immutable()')
  await q.dropTable('treatment_plans')
}
