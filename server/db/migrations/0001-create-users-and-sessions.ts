import { DataTypes, type QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('CREATE EXTENSION IF NOT EXISTS pgcrypto')
  await q.createTable('users', {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: q.sequelize.literal('gen_random_uuid()') },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('listener', 'advisor', 'supervisor'), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    units: { type: DataTypes.ENUM('metric', 'imperial'), allowNull: false, defaultValue: 'metric' },
    email_optional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: q.sequelize.literal('now()') },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: q.sequelize.literal('now()') },
  })
  await q.sequelize.query('CREATE UNIQUE INDEX users_email_lower ON users (lower(email))')
  await q.addIndex('users', ['role'])
  // The table connect-pg-simple expects (its own table.sql), created here so that no library creates schema at run time.
  await q.sequelize.query(`
    CREATE TABLE "session" (
      "sid" varchar NOT NULL COLLATE "default" PRIMARY KEY,
      "sess" json NOT NULL,
      "expire" timestamp(6) NOT NULL
    )`)
  await q.sequelize.query('CREATE INDEX "IDX_session_expire" ON "session" ("expire")')
  await q.sequelize.query(`ALTER TABLE "session" ADD COLUMN user_id uuid GENERATED ALWAYS AS (((sess -> 'passport') ->> 'user')::uuid) STORED`)
  await q.sequelize.query('CREATE INDEX session_user_id ON "session" (user_id)')
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('session')
  await q.dropTable('users')
  await q.sequelize.query('DROP TYPE IF EXISTS enum_users_role; DROP TYPE IF EXISTS enum_users_units')
}
