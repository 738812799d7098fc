import type { QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE email_outbox (
      id uuid PRIMARY KEY,
      to_address varchar(254) NOT NULL,
      to_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      kind varchar(40) NOT NULL,
      case_id uuid REFERENCES cases(id) ON DELETE SET NULL,
      subject varchar(300) NOT NULL,
      html text NOT NULL,
      text text NOT NULL,
      reply_to varchar(254),
      status varchar(10) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'sent', 'failed')),
      attempts integer NOT NULL DEFAULT 0,
      last_error text,
      next_attempt_at timestamptz NOT NULL DEFAULT now(),
      sent_at timestamptz,
      message_id varchar(255) NOT NULL UNIQUE,
      job_id uuid,
      smtp_response text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX email_outbox_queued ON email_outbox (next_attempt_at) WHERE status = 'queued';
    CREATE INDEX email_outbox_case ON email_outbox (case_id, created_at) WHERE case_id IS NOT NULL;
    CREATE INDEX email_outbox_user ON email_outbox (to_user_id, created_at) WHERE to_user_id IS NOT NULL;

    CREATE TABLE dev_mailbox (
      id bigserial PRIMARY KEY,
      message_id varchar(255),
      envelope_from varchar(254),
      envelope_to text[] NOT NULL DEFAULT '{}',
      subject text NOT NULL DEFAULT '',
      text text,
      html text,
      headers jsonb NOT NULL DEFAULT '{}',
      raw_size integer NOT NULL,
      received_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX dev_mailbox_received ON dev_mailbox (received_at DESC);
    CREATE INDEX dev_mailbox_message_id ON dev_mailbox (message_id);

    CREATE TABLE inbound_email_log (
      id bigserial PRIMARY KEY,
      via varchar(10) NOT NULL CHECK (via IN ('smtp', 'webhook')),
      status varchar(10) NOT NULL CHECK (status IN ('accepted', 'rejected')),
      reason varchar(40),
      to_address text,
      from_address text,
      subject text,
      case_id uuid REFERENCES cases(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX inbound_email_log_time ON inbound_email_log (created_at DESC);
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE inbound_email_log; DROP TABLE dev_mailbox; DROP TABLE email_outbox;')
}
