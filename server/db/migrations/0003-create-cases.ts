import type { QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TYPE case_status AS ENUM ('draft', 'submitted', 'in_review', 'waiting_on_listener', 'plan_sent', 'closed');
    CREATE TABLE cases (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      listener_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      room_id uuid NOT NULL REFERENCES rooms(id) ON DELETE RESTRICT,
      room_revision integer NOT NULL,
      title varchar(160) NOT NULL,
      description text NOT NULL DEFAULT '',
      answers jsonb NOT NULL DEFAULT '{}',
      status case_status NOT NULL DEFAULT 'draft',
      assignee_id uuid REFERENCES users(id) ON DELETE SET NULL,
      score real,
      flag_ids text[] NOT NULL DEFAULT '{}',
      reply_token varchar(64) NOT NULL UNIQUE,
      submitted_at timestamptz,
      waiting_since timestamptz,
      first_response_at timestamptz,
      closed_at timestamptz,
      last_activity_at timestamptz NOT NULL DEFAULT now(),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      search tsvector GENERATED ALWAYS AS (
        setweight(to_tsvector('english', coalesce(title, '')), 'A') || setweight(to_tsvector('english', coalesce(description, '')), 'B')
      ) STORED
    );
    CREATE INDEX cases_listener ON cases (listener_id, last_activity_at DESC);
    CREATE INDEX cases_status_score ON cases (status, score DESC);
    CREATE INDEX cases_assignee ON cases (assignee_id, status);
    CREATE INDEX cases_waiting ON cases (waiting_since) WHERE waiting_since IS NOT NULL;
    CREATE INDEX cases_last_activity ON cases (last_activity_at DESC);
    CREATE INDEX cases_flags ON cases USING gin (flag_ids);
    CREATE INDEX cases_search ON cases USING gin (search);

    CREATE TABLE case_events (
      id bigserial PRIMARY KEY,
      case_id uuid NOT NULL REFERENCES cases(id) ON DELETE CASCADE,
      actor_id uuid REFERENCES users(id) ON DELETE SET NULL,
      kind varchar(40) NOT NULL,
      from_status case_status,
      to_status case_status,
      data jsonb NOT NULL DEFAULT '{}',
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX case_events_case ON case_events (case_id, id);
    CREATE INDEX case_events_kind_time ON case_events (kind, created_at);

    CREATE TABLE messages (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      case_id uuid NOT NULL REFERENCES cases(id) ON DELETE CASCADE,
      author_id uuid REFERENCES users(id) ON DELETE SET NULL,
      body text NOT NULL,
      internal boolean NOT NULL DEFAULT false,
      source varchar(10) NOT NULL DEFAULT 'app',
      created_at timestamptz NOT NULL DEFAULT now(),
      search tsvector GENERATED ALWAYS AS (to_tsvector('english', body)) STORED
    );
    CREATE INDEX messages_case ON messages (case_id, created_at);
    CREATE INDEX messages_search ON messages USING gin (search);

    CREATE TABLE files (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      case_id uuid NOT NULL REFERENCES cases(id) ON DELETE CASCADE,
      uploader_id uuid REFERENCES users(id) ON DELETE SET NULL,
      message_id uuid REFERENCES messages(id) ON DELETE SET NULL,
      kind varchar(20) NOT NULL,
      original_name varchar(255) NOT NULL,
      mime varchar(100) NOT NULL,
      size bigint NOT NULL,
      storage_key varchar(255) NOT NULL,
      thumb_key varchar(255),
      analysis_status varchar(10),
      analysis jsonb,
      analysis_error text,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX files_case ON files (case_id, created_at);

    CREATE TABLE triage_snapshots (
      id bigserial PRIMARY KEY,
      case_id uuid NOT NULL REFERENCES cases(id) ON DELETE CASCADE,
      room_revision integer NOT NULL,
      engine_version varchar(40) NOT NULL,
      body jsonb NOT NULL,
      score real NOT NULL,
      computed_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX triage_case ON triage_snapshots (case_id, id DESC);
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    DROP TABLE triage_snapshots; DROP TABLE files; DROP TABLE messages; DROP TABLE case_events; DROP TABLE cases; DROP TYPE case_status;
  `)
}
