import { DataTypes, Op, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, maybeAt, ref, serialKey, stamp, uuidKey } from '../migration-columns'

/** The case status enum, named by us (QueryInterface would name it enum_cases_status and make one per table). */
const caseStatus = 'case_status' as unknown as typeof DataTypes.STRING

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  // Raw SQL: QueryInterface cannot create an enum type of our own name.
  await q.sequelize.query(`CREATE TYPE case_status AS ENUM ('draft', 'submitted', 'in_review', 'waiting_on_listener', 'plan_sent', 'closed')`)
  await q.createTable('cases', {
    id: uuidKey(),
    listener_id: ref('users', 'CASCADE', true),
    room_id: ref('rooms', 'RESTRICT', true),
    room_revision: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.STRING(160), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    answers: { type: DataTypes.JSONB, allowNull: false, defaultValue: emptyLiteral() },
    status: { type: caseStatus, allowNull: false, defaultValue: 'draft' },
    assignee_id: ref('users', 'SET NULL'),
    score: { type: DataTypes.REAL, allowNull: true },
    flag_ids: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: emptyLiteral() },
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
    kind: { type: DataTypes.STRING(40), allowNull: false },
    from_status: { type: caseStatus, allowNull: true },
    to_status: { type: caseStatus, allowNull: true },
    data: { type: DataTypes.JSONB, allowNull: false, defaultValue: emptyLiteral() },
    created_at: stamp(),
  })
  await q.addIndex('case_events', { fields: ['case_id', 'id'], name: 'case_events_case' })
  await q.addIndex('case_events', { fields: ['kind', 'created_at'], name: 'case_events_kind_time' })

  await q.createTable('messages', {
    id: uuidKey(),
    case_id: ref('cases', 'CASCADE', true),
    author_id: ref('users', 'SET NULL'),
    body: { type: DataTypes.TEXT, allowNull: false },
    internal: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    source: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'app' },
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
    kind: { type: DataTypes.STRING(20), allowNull: false },
    original_name: { type: DataTypes.STRING(255), allowNull: false },
    mime: { type: DataTypes.STRING(100), allowNull: false },
    size: { type: DataTypes.BIGINT, allowNull: false },
    storage_key: { type: DataTypes.STRING(255), allowNull: false },
    thumb_key: { type: DataTypes.STRING(255), allowNull: true },
    analysis_status: { type: DataTypes.STRING(10), allowNull: true },
    analysis: { type: DataTypes.JSONB, allowNull: true },
    analysis_error: { type: DataTypes.TEXT, allowNull: true },
    created_at: stamp(),
  })
  await q.addIndex('files', { fields: ['case_id', 'created_at'], name: 'files_case' })

  await q.createTable('triage_snapshots', {
    id: serialKey(),
    case_id: ref('cases', 'CASCADE', true),
    room_revision: { type: DataTypes.INTEGER, allowNull: false },
    engine_version: { type: DataTypes.STRING(40), allowNull: false },
    body: { type: DataTypes.JSONB, allowNull: false },
    score: { type: DataTypes.REAL, allowNull: false },
    computed_at: stamp(),
  })
  await q.addIndex('triage_snapshots', { fields: ['case_id', desc('id')], name: 'triage_case' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const table of ['triage_snapshots', 'files', 'messages', 'case_events', 'cases']) await q.dropTable(table)
  // Raw SQL: the enum type of our own name (see up).
  await q.sequelize.query('DROP TYPE case_status')
}
