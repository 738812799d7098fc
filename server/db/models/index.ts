/**
 * Every application table's model, bound to the process's Sequelize instance, with the associations
 * and the visibility scopes declared once here. Call `models()`; it (re)binds the models when the
 * Sequelize instance changed (tests and the bench close and reopen it).
 */
import { Op, col, literal, where, type BelongsToOptions, type Model, type ModelStatic, type Sequelize } from 'sequelize'
import { db } from '../sequelize'
import { UserModel, initUser } from './user'
import { RoomModel, RoomRevisionModel, initRooms } from './room'
import { CaseModel, CaseEventModel, CaseRatingModel, TriageSnapshotModel, initCases } from './case'
import { MessageModel, initMessages } from './message'
import { FileModel, initFiles } from './file'
import { TreatmentPlanModel, initPlans } from './plan'
import { EmailOutboxModel, DevMailboxModel, InboundEmailLogModel, InboundEmailReceiptModel, initMail } from './mail'
import { ReplySnippetModel, SavedFilterModel, DeskSettingsModel, initDesk } from './desk'
import { TeamInvitationModel, AuditLogModel, PasswordResetTokenModel, SessionModel, initTeam } from './team'
import { RateLimitHitModel, initRateLimit } from './rate-limit'
import { sharedWithListener, type Audience } from '../../data/visibility'

export {
  UserModel, RoomModel, RoomRevisionModel, CaseModel, CaseEventModel, CaseRatingModel, TriageSnapshotModel, MessageModel, FileModel,
  TreatmentPlanModel, EmailOutboxModel, DevMailboxModel, InboundEmailLogModel, ReplySnippetModel, SavedFilterModel, DeskSettingsModel,
  TeamInvitationModel, AuditLogModel, PasswordResetTokenModel, SessionModel, RateLimitHitModel, InboundEmailReceiptModel,
}

// Built on first use: user.ts imports this module back (for `userModel()`), so the classes may not exist yet at load time.
const build = () => ({
  User: UserModel, Room: RoomModel, RoomRevision: RoomRevisionModel, Case: CaseModel, CaseEvent: CaseEventModel, CaseRating: CaseRatingModel,
  TriageSnapshot: TriageSnapshotModel, Message: MessageModel, File: FileModel, TreatmentPlan: TreatmentPlanModel,
  EmailOutbox: EmailOutboxModel, DevMailbox: DevMailboxModel, InboundEmailLog: InboundEmailLogModel, ReplySnippet: ReplySnippetModel,
  SavedFilter: SavedFilterModel, DeskSettings: DeskSettingsModel, TeamInvitation: TeamInvitationModel, AuditLog: AuditLogModel, PasswordResetToken: PasswordResetTokenModel, Session: SessionModel,
  RateLimitHit: RateLimitHitModel, InboundEmailReceipt: InboundEmailReceiptModel,
})
export type Models = ReturnType<typeof build>
let all: Models

let boundTo: Sequelize | undefined

export function models(): Models {
  const sequelize = db()
  if (boundTo !== sequelize) {
    all ??= build()
    for (const m of Object.values(all)) (m as unknown as { associations: object }).associations = {}
    initUser(sequelize)
    initRooms(sequelize)
    initCases(sequelize)
    initMessages(sequelize)
    initFiles(sequelize)
    initPlans(sequelize)
    initMail(sequelize)
    initDesk(sequelize)
    initTeam(sequelize)
    initRateLimit(sequelize)
    associate()
    addScopes()
    boundTo = sequelize
  }
  return all
}

/**
 * Every association, in the order they are declared (the order the foreign-key attributes are added in):
 * [model, kind, target, alias, foreign key by attribute name (the column is its snake_case twin) or the
 * options in full, NOT NULL]. A foreign key given by name gets `allowNull: false` where the column is NOT NULL.
 */
type Link = [keyof Models, 'belongsTo' | 'hasMany' | 'hasOne', keyof Models, string, string | BelongsToOptions, true?]
const links: Link[] = [
  ['User', 'hasMany', 'Room', 'rooms', 'ownerId', true],
  ['Room', 'belongsTo', 'User', 'owner', 'ownerId', true],
  ['Room', 'hasMany', 'RoomRevision', 'revisions', 'roomId', true],
  ['RoomRevision', 'belongsTo', 'Room', 'room', 'roomId', true],
  // The current revision: (room_id, current_revision); the `withCurrent` scope gives the join condition.
  ['Room', 'hasOne', 'RoomRevision', 'current', { foreignKey: 'roomId', constraints: false }],
  ['RoomRevision', 'belongsTo', 'User', 'author', 'createdBy'],
  ['Case', 'belongsTo', 'User', 'listener', 'listenerId', true],
  ['Case', 'belongsTo', 'User', 'assignee', 'assigneeId'],
  ['Case', 'belongsTo', 'Room', 'room', 'roomId', true],
  // The room revision a case is about: (room_id, room_revision). Sequelize has no composite keys, so
  // the association names the target and the `withRoom` scope states the join condition with `on`.
  ['Case', 'belongsTo', 'RoomRevision', 'revision', { foreignKey: 'roomId', targetKey: 'roomId', constraints: false }],
  ['User', 'hasMany', 'Case', 'cases', 'listenerId', true],
  ['Case', 'hasMany', 'Message', 'messages', 'caseId', true],
  ['Message', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['Message', 'belongsTo', 'User', 'author', 'authorId'],
  ['Case', 'hasMany', 'File', 'files', 'caseId', true],
  ['File', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['File', 'belongsTo', 'User', 'uploader', 'uploaderId'],
  ['Message', 'hasMany', 'File', 'files', 'messageId'],
  ['File', 'belongsTo', 'Message', 'message', 'messageId'],
  ['Case', 'hasMany', 'CaseEvent', 'events', 'caseId', true],
  ['CaseEvent', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['CaseEvent', 'belongsTo', 'User', 'actor', 'actorId'],
  // case_ratings' primary key is case_id: a case has at most one rating.
  ['Case', 'hasOne', 'CaseRating', 'rating', 'caseId', true],
  ['CaseRating', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['CaseRating', 'belongsTo', 'User', 'listener', 'listenerId', true],
  ['Case', 'hasMany', 'TreatmentPlan', 'plans', 'caseId', true],
  ['TreatmentPlan', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['TreatmentPlan', 'belongsTo', 'Room', 'room', 'roomId', true],
  ['TreatmentPlan', 'belongsTo', 'User', 'creator', 'createdBy'],
  ['TreatmentPlan', 'belongsTo', 'User', 'sender', 'sentBy'],
  ['Case', 'hasMany', 'TriageSnapshot', 'triages', 'caseId', true],
  ['TriageSnapshot', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['EmailOutbox', 'belongsTo', 'User', 'recipient', 'toUserId'],
  ['EmailOutbox', 'belongsTo', 'Case', 'case', 'caseId'],
  ['InboundEmailLog', 'belongsTo', 'Case', 'case', 'caseId'],
  ['InboundEmailReceipt', 'belongsTo', 'Case', 'case', 'caseId', true],
  ['InboundEmailReceipt', 'belongsTo', 'Message', 'message', 'messageId'],
  ['ReplySnippet', 'belongsTo', 'User', 'author', 'createdBy'],
  ['User', 'hasMany', 'SavedFilter', 'savedFilters', 'userId', true],
  ['SavedFilter', 'belongsTo', 'User', 'owner', 'userId', true],
  ['DeskSettings', 'belongsTo', 'User', 'editor', 'updatedBy'],
  ['TeamInvitation', 'belongsTo', 'User', 'inviter', 'invitedBy'],
  ['TeamInvitation', 'belongsTo', 'User', 'acceptedUser', 'acceptedUserId'],
  ['AuditLog', 'belongsTo', 'User', 'actor', 'actorId'],
  ['AuditLog', 'belongsTo', 'User', 'targetUser', 'targetUserId'],
  ['User', 'hasMany', 'PasswordResetToken', 'passwordResetTokens', 'userId', true],
  ['PasswordResetToken', 'belongsTo', 'User', 'user', 'userId', true],
  ['Session', 'belongsTo', 'User', 'user', { foreignKey: 'userId', constraints: false }],
]

function associate() {
  for (const [name, kind, targetName, as, key, required = false] of links) {
    const [source, target] = [all[name], all[targetName]] as unknown as ModelStatic<Model>[]
    const options = typeof key === 'string' ? { as, foreignKey: { name: key, allowNull: !required } } : { as, ...key }
    if (kind === 'belongsTo') source.belongsTo(target, options)
    else if (kind === 'hasMany') source.hasMany(target, options)
    else source.hasOne(target, options)
  }
}

const person = ['id', 'name']

function addScopes() {
  const { User, RoomRevision, Case, CaseEvent, Message, File, TreatmentPlan } = all

  /** A room with the body of its current revision. */
  all.Room.addScope('withCurrent', {
    include: [{ model: RoomRevision, as: 'current', attributes: ['revision', 'body'], on: { [Op.and]: [where(col('current.room_id'), Op.eq, col('Room.id')), where(col('current.revision'), Op.eq, col('Room.current_revision'))] }, required: true }],
  })
  /** A case with what every listing shows: listener, assignee, room and the revision the case is about. */
  Case.addScope('withRoom', {
    include: [
      { model: User, as: 'listener', attributes: person, required: true },
      { model: User, as: 'assignee', attributes: person, required: false },
      { association: 'room', attributes: ['id', 'name'], required: true },
      {
        model: RoomRevision, as: 'revision', attributes: ['revision', 'body'],
        on: { [Op.and]: [where(col('revision.room_id'), Op.eq, col('Case.room_id')), where(col('revision.revision'), Op.eq, col('Case.room_revision'))] },
        required: true,
      },
    ],
  })
  // --- what a case's listener may see: THE rule of server/data/visibility.ts (sharedWithListener), one scope per
  // model over the model's own alias, so the thread, file list, download, history and socket catch-up share it.
  const scopeFor = (kind: keyof typeof sharedWithListener, alias: string) => (audience: Audience) =>
    audience === 'team' ? {} : { where: literal(sharedWithListener[kind](`"${alias}"`)) }
  Message.addScope('visibleTo', scopeFor('message', 'Message'))
  File.addScope('visibleTo', scopeFor('file', 'File'))
  CaseEvent.addScope('visibleTo', scopeFor('event', 'CaseEvent'))
  /** A message as the thread shows it: author and the ids of its attached files. */
  Message.addScope('thread', {
    include: [
      { model: User, as: 'author', attributes: ['id', 'name', 'role'], required: false },
      { model: File, as: 'files', attributes: ['id', 'createdAt'], required: false, separate: false },
    ],
  })
  CaseEvent.addScope('withActor', { include: [{ model: User, as: 'actor', attributes: person, required: false }] })
  TreatmentPlan.addScope('withPeople', {
    include: [
      { model: User, as: 'creator', attributes: person, required: false },
      { model: User, as: 'sender', attributes: person, required: false },
    ],
  })
  TreatmentPlan.addScope('sent', { where: { sentAt: { [Op.ne]: null } } })
}
