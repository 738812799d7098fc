import { DataTypes, type QueryInterface } from 'sequelize'
import { lower, optional, required, stamp, uuidKey } from '../columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  // Raw SQL: QueryInterface cannot create an extension (pgcrypto, for gen_random_uuid on older servers).
  await q.sequelize.query('CREATE EXTENSION IF NOT EXISTS pgcrypto')
  await q.createTable('users', {
    id: uuidKey(),
    email: required(DataTypes.STRING(254)),
    name: required(DataTypes.STRING(120)),
    role: required(DataTypes.ENUM('listener', 'advisor', 'supervisor')),
    password_hash: optional(DataTypes.STRING(100)),
    active: required(DataTypes.BOOLEAN, true),
    units: required(DataTypes.ENUM('metric', 'imperial'), 'metric'),
    email_optional: required(DataTypes.BOOLEAN, true),
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addIndex('users', { fields: [lower('email')], name: 'users_email_lower', unique: true })
  await q.addIndex('users', ['role'])
  // The table connect-pg-simple expects (its own table.sql: varchar without a length, timestamp(6) without
  // time zone), created here so that no library creates schema at run time.
  await q.createTable('session', {
    sid: { type: 'VARCHAR', allowNull: false, primaryKey: true },
    sess: required(DataTypes.JSON),
    expire: required('TIMESTAMP(6)'),
  })
  await q.addIndex('session', { fields: ['expire'], name: 'IDX_session_expire' })
  // Raw SQL: QueryInterface cannot say a generated column.
  await q.sequelize.query(`ALTER TABLE "session" ADD COLUMN user_id uuid GENERATED ALWAYS AS (((sess -> 'passport') ->> 'user')::uuid) STORED`)
  await q.addIndex('session', { fields: ['user_id'], name: 'session_user_id' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('session')
  await q.dropTable('users')
  // Raw SQL: QueryInterface's dropTable leaves the enum types that createTable made.
  await q.sequelize.query('DROP TYPE IF EXISTS enum_users_role; DROP TYPE IF EXISTS enum_users_units')
}
