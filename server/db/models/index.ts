/**
 * Every application table's model, bound to the process's Sequelize instance, with the associations
 * and the visibility scopes declared once here. Call `models()`; it (re)binds the models when the
 * Sequelize instance changed (tests and the bench close and reopen it).
 */
import { Op, col, literal, where, type Sequelize } from 'sequelize'
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

/** Foreign keys by attribute name (the column is its snake_case twin); `allowNull: false` where the column is NOT NULL. */
const fk = (name: string, required = false) => ({ foreignKey: { name, allowNull: !required } })

function associate() {
  const { User, Room, RoomRevision, Case, CaseEvent, CaseRating, TriageSnapshot, Message, File, TreatmentPlan } = all

  User.hasMany(Room, { as: 'rooms', ...fk('ownerId', true) })
  Room.belongsTo(User, { as: 'owner', ...fk('ownerId', true) })
  Room.hasMany(RoomRevision, { as: 'revisions', ...fk('roomId', true) })
  RoomRevision.belongsTo(Room, { as: 'room', ...fk('roomId', true) })
  // The current revision: (room_id, current_revision); the `withCurrent` scope gives the join condition.
  Room.hasOne(RoomRevision, { as: 'current', foreignKey: 'roomId', constraints: false })
  RoomRevision.belongsTo(User, { as: 'author', ...fk('createdBy') })

  Case.belongsTo(User, { as: 'listener', ...fk('listenerId', true) })
  Case.belongsTo(User, { as: 'assignee', ...fk('assigneeId') })
  Case.belongsTo(Room, { as: 'room', ...fk('roomId', true) })
  // The room revision a case is about: (room_id, room_revision). Sequelize has no composite keys, so
  // the association names the target and the `withRoom` scope states the join condition with `on`.
  Case.belongsTo(RoomRevision, { as: 'revision', foreignKey: 'roomId', targetKey: 'roomId', constraints: false })
  User.hasMany(Case, { as: 'cases', ...fk('listenerId', true) })

  Case.hasMany(Message, { as: 'messages', ...fk('caseId', true) })
  Message.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  Message.belongsTo(User, { as: 'author', ...fk('authorId') })

  Case.hasMany(File, { as: 'files', ...fk('caseId', true) })
  File.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  File.belongsTo(User, { as: 'uploader', ...fk('uploaderId') })
  Message.hasMany(File, { as: 'files', ...fk('messageId') })
  File.belongsTo(Message, { as: 'message', ...fk('messageId') })

  Case.hasMany(CaseEvent, { as: 'events', ...fk('caseId', true) })
  CaseEvent.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  CaseEvent.belongsTo(User, { as: 'actor', ...fk('actorId') })

  // case_ratings' primary key is case_id: a case has at most one rating.
  Case.hasOne(CaseRating, { as: 'rating', ...fk('caseId', true) })
  CaseRating.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  CaseRating.belongsTo(User, { as: 'listener', ...fk('listenerId', true) })

  Case.hasMany(TreatmentPlan, { as: 'plans', ...fk('caseId', true) })
  TreatmentPlan.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  TreatmentPlan.belongsTo(Room, { as: 'room', ...fk('roomId', true) })
  TreatmentPlan.belongsTo(User, { as: 'creator', ...fk('createdBy') })
  TreatmentPlan.belongsTo(User, { as: 'sender', ...fk('sentBy') })

  Case.hasMany(TriageSnapshot, { as: 'triages', ...fk('caseId', true) })
  TriageSnapshot.belongsTo(Case, { as: 'case', ...fk('caseId', true) })

  all.EmailOutbox.belongsTo(User, { as: 'recipient', ...fk('toUserId') })
  all.EmailOutbox.belongsTo(Case, { as: 'case', ...fk('caseId') })
  all.InboundEmailLog.belongsTo(Case, { as: 'case', ...fk('caseId') })
  all.InboundEmailReceipt.belongsTo(Case, { as: 'case', ...fk('caseId', true) })
  all.InboundEmailReceipt.belongsTo(Message, { as: 'message', ...fk('messageId') })
  all.ReplySnippet.belongsTo(User, { as: 'author', ...fk('createdBy') })
  User.hasMany(all.SavedFilter, { as: 'savedFilters', ...fk('userId', true) })
  all.SavedFilter.belongsTo(User, { as: 'owner', ...fk('userId', true) })
  all.DeskSettings.belongsTo(User, { as: 'editor', ...fk('updatedBy') })
  all.TeamInvitation.belongsTo(User, { as: 'inviter', ...fk('invitedBy') })
  all.TeamInvitation.belongsTo(User, { as: 'acceptedUser', ...fk('acceptedUserId') })
  all.AuditLog.belongsTo(User, { as: 'actor', ...fk('actorId') })
  all.AuditLog.belongsTo(User, { as: 'targetUser', ...fk('targetUserId') })
  User.hasMany(all.PasswordResetToken, { as: 'passwordResetTokens', ...fk('userId', true) })
  all.PasswordResetToken.belongsTo(User, { as: 'user', ...fk('userId', true) })
  all.Session.belongsTo(User, { as: 'user', foreignKey: 'userId', constraints: false })
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
