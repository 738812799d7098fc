import { DataTypes, Op, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, maybeAt, optional, ref, required, serialKey, stamp, uuidKey } from '../columns'

/** The case status enum, named by us (QueryInterface would name it enum_cases_status and make one per table). */
const caseStatus = 'case_status' as unknown as typeof DataTypes.STRING

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  // Raw SQL: QueryInterface cannot create an enum type of our own name.
  await q.sequelize.query(`CREATE TYPE case_status AS ENUM ('draft', 'submitted', 'in_review', 'waiting_on_listener', 'plan_sent', 'closed')`)
  await q.createTable('cases', {
    id: uuidKey(),
    listener_id: ref('users', 'CASCADE', true),
    room_id: ref('rooms', 'RESTRICT', true),
    room_revision: required(DataTypes.INTEGER),
    title: required(DataTypes.STRING(160)),
    description: required(DataTypes.TEXT, ''),
    answers: required(DataTypes.JSONB, emptyLiteral()),
    status: required(caseStatus, 'draft'),
    assignee_id: ref('users', 'SET NULL'),
    score: optional(DataTypes.REAL),
    flag_ids: required(DataTypes.ARRAY(DataTypes.TEXT), emptyLiteral()),
    reply_token: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    submitted_at: maybeAt(),
    waiting_since: maybeAt(),
    first_response_at: maybeAt(),
    closed_at: maybeAt(),
    last_activity_at: stamp(),
    created_at: stamp(),
    updated_at: stamp(),
  })
  // Raw SQL: QueryInterface cannot say a generated column (the full-text document of the case).
  await q.sequelize.query(`ALTER TABLE cases ADD COLUMN search tsvector GENERATED ALWAYS AS (
    setweight(to_tsvector('english', coalesce(title, '')), 'A') || setweight(to_tsvector('english', coalesce(description, '')), 'B')
  ) STORED`)
  await q.addIndex('cases', { fields: ['listener_id', desc('last_activity_at')], name: 'cases_listener' })
  await q.addIndex('cases', { fields: ['status', desc('score')], name: 'cases_status_score' })
  await q.addIndex('cases', { fields: ['assignee_id', 'status'], name: 'cases_assignee' })
  await q.addIndex('cases', { fields: ['waiting_since'], name: 'cases_waiting', where: { waiting_since: { [Op.ne]: null } } })
  await q.addIndex('cases', { fields: [desc('last_activity_at')], name: 'cases_last_activity' })
  await q.addIndex('cases', { fields: ['flag_ids'], name: 'cases_flags', using: 'gin' })
  await q.addIndex('cases', { fields: ['search'], name: 'cases_search', using: 'gin' })

  await q.createTable('case_events', {
    id: serialKey(),
    case_id: ref('cases', 'CASCADE', true),
    actor_id: ref('users', 'SET NULL'),
    kind: required(DataTypes.STRING(40)),
    from_status: optional(caseStatus),
    to_status: optional(caseStatus),
    data: required(DataTypes.JSONB, emptyLiteral()),
    created_at: stamp(),
  })
  await q.addIndex('case_events', { fields: ['case_id', 'id'], name: 'case_events_case' })
  await q.addIndex('case_events', { fields: ['kind', 'created_at'], name: 'case_events_kind_time' })

  await q.createTable('messages', {
    id: uuidKey(),
    case_id: ref('cases', 'CASCADE', true),
    author_id: ref('users', 'SET NULL'),
    body: required(DataTypes.TEXT),
    internal: required(DataTypes.BOOLEAN, false),
    source: required(DataTypes.STRING(10), 'app'),
    created_at: stamp(),
  })
  // Raw SQL: QueryInterface cannot say a generated column (the full-text document of the message).
  await q.sequelize.query(`ALTER TABLE messages ADD COLUMN search tsvector GENERATED ALWAYS AS (to_tsvector('english', body)) STORED`)
  await q.addIndex('messages', { fields: ['case_id', 'created_at'], name: 'messages_case' })
  await q.addIndex('messages', { fields: ['search'], name: 'messages_search', using: 'gin' })

  await q.createTable('files', {
    id: uuidKey(),
    case_id: ref('cases', 'CASCADE', true),
    uploader_id: ref('users', 'SET NULL'),
    message_id: ref('messages', 'SET NULL'),
    kind: required(DataTypes.STRING(20)),
    original_name: required(DataTypes.STRING(255)),
    mime: required(DataTypes.STRING(100)),
    size: required(DataTypes.BIGINT),
    storage_key: required(DataTypes.STRING(255)),
    thumb_key: optional(DataTypes.STRING(255)),
    analysis_status: optional(DataTypes.STRING(10)),
    analysis: optional(DataTypes.JSONB),
    analysis_error: optional(DataTypes.TEXT),
    created_at: stamp(),
  })
  await q.addIndex('files', { fields: ['case_id', 'created_at'], name: 'files_case' })

  await q.createTable('triage_snapshots', {
    id: serialKey(),
    case_id: ref('cases', 'CASCADE', true),
    room_revision: required(DataTypes.INTEGER),
    engine_version: required(DataTypes.STRING(40)),
    body: required(DataTypes.JSONB),
    score: required(DataTypes.REAL),
    computed_at: stamp(),
  })
  await q.addIndex('triage_snapshots', { fields: ['case_id', desc('id')], name: 'triage_case' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const table of ['triage_snapshots', 'files', 'messages', 'case_events', 'cases']) await q.dropTable(table)
  // Raw SQL: the enum type of our own name (see up).
  await q.sequelize.query('DROP TYPE case_status')
}
