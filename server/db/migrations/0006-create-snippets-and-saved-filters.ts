import type { QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE reply_snippets (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      title varchar(80) NOT NULL,
      body text NOT NULL,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX reply_snippets_title ON reply_snippets (lower(title));
    CREATE TABLE saved_filters (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      name varchar(60) NOT NULL,
      query jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX saved_filters_user_name ON saved_filters (user_id, lower(name));
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE saved_filters; DROP TABLE reply_snippets;')
}
