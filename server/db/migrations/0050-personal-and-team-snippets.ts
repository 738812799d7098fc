import type { QueryInterface } from 'sequelize'

/**
 * Reply snippets get an owner scope: `personal` ones belong to their author alone (created_by),
 * `team` ones are shared and every change to them is written to the audit log. Snippets that
 * existed before were shared with everyone, so they become team snippets. Titles are unique per
 * author among personal snippets and across the team among team snippets.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    ALTER TABLE reply_snippets ADD COLUMN scope varchar(8) NOT NULL DEFAULT 'team' CHECK (scope IN ('personal', 'team'));
    ALTER TABLE reply_snippets ALTER COLUMN scope SET DEFAULT 'personal';
    DROP INDEX reply_snippets_title;
    CREATE UNIQUE INDEX reply_snippets_team_title ON reply_snippets (lower(title)) WHERE scope = 'team';
    CREATE UNIQUE INDEX reply_snippets_personal_title ON reply_snippets (created_by, lower(title)) WHERE scope = 'personal';
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    DROP INDEX reply_snippets_personal_title;
    DROP INDEX reply_snippets_team_title;
    DELETE FROM reply_snippets a USING reply_snippets b WHERE a.scope = 'personal' AND lower(a.title) = lower(b.title) AND a.id <> b.id AND (b.scope = 'team' OR b.id < a.id);
    CREATE UNIQUE INDEX reply_snippets_title ON reply_snippets (lower(title));
    ALTER TABLE reply_snippets DROP COLUMN scope;
  `)
}
