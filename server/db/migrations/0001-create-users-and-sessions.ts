import { DataTypes, type QueryInterface } from 'sequelize'
import { lower, stamp, uuidKey } from '../migration-columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  // Raw SQL: QueryInterface cannot create an extension (pgcrypto, for gen_random_uuid on older servers).
  await q.sequelize.query('CREATE EXTENSION IF NOT EXISTS pgcrypto')
  await q.createTable('users', {
    id: uuidKey(),
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('listener', 'advisor', 'supervisor'), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    units: { type: DataTypes.ENUM('metric', 'imperial'), allowNull: false, defaultValue: 'metric' },
    email_optional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addIndex('users', { fields: [lower('email')], name: 'users_email_lower', unique: true })
  await q.addIndex('users', ['role'])
  // The table connect-pg-simple expects (its own table.sql: varchar without a length, timestamp(6) without
  // time zone), created here so that no library creates schema at run time.
  await q.createTable('session', {
    sid: { type: 'VARCHAR', allowNull: false, primaryKey: true },
    sess: { type: DataTypes.JSON, allowNull: false },
    expire: { type: 'TIMESTAMP(6)', allowNull: false },
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
