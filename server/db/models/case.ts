import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import { caseStatuses, type CaseDetail, type CaseStatus } from '../../../shared/schemas/case'
import type { TriageSnapshot } from '../../../shared/schemas/triage'
import type { UserModel } from './user'
import type { RoomModel, RoomRevisionModel } from './room'
import type { MessageModel } from './message'
import type { FileModel } from './file'
import type { TreatmentPlanModel } from './plan'
import { appUuidKey, maybeAt, optional, required, serialKey, stampNow, timestamps } from '../columns'

export type FlagSummary = { id: string; severity: string }

export class CaseModel extends Model<InferAttributes<CaseModel>, InferCreationAttributes<CaseModel>> {
  declare id: CreationOptional<string>
  declare listenerId: ForeignKey<UserModel['id']>
  declare roomId: ForeignKey<RoomModel['id']>
  declare roomRevision: number
  declare title: string
  declare description: CreationOptional<string>
  declare answers: CreationOptional<CaseDetail['answers']>
  declare status: CreationOptional<CaseStatus>
  declare assigneeId: ForeignKey<UserModel['id']> | null
  declare score: CreationOptional<number | null>
  declare flagIds: CreationOptional<string[]>
  declare flags: CreationOptional<FlagSummary[]>
  declare replyToken: string
  declare submittedAt: CreationOptional<Date | null>
  declare waitingSince: CreationOptional<Date | null>
  declare firstResponseAt: CreationOptional<Date | null>
  declare closedAt: CreationOptional<Date | null>
  declare lastActivityAt: CreationOptional<Date>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  declare listener?: NonAttribute<UserModel>
  declare assignee?: NonAttribute<UserModel | null>
  declare room?: NonAttribute<RoomModel>
  declare revision?: NonAttribute<RoomRevisionModel>
  declare messages?: NonAttribute<MessageModel[]>
  declare files?: NonAttribute<FileModel[]>
  declare events?: NonAttribute<CaseEventModel[]>
  declare rating?: NonAttribute<CaseRatingModel | null>
  declare plans?: NonAttribute<TreatmentPlanModel[]>
  declare triages?: NonAttribute<TriageSnapshotModel[]>
}

export class CaseEventModel extends Model<InferAttributes<CaseEventModel>, InferCreationAttributes<CaseEventModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare actorId: ForeignKey<UserModel['id']> | null
  declare kind: string
  declare fromStatus: CaseStatus | null
  declare toStatus: CaseStatus | null
  declare data: CreationOptional<Record<string, unknown>>
  declare createdAt: CreationOptional<Date>
  declare actor?: NonAttribute<UserModel | null>
}

export class TriageSnapshotModel extends Model<InferAttributes<TriageSnapshotModel>, InferCreationAttributes<TriageSnapshotModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare roomRevision: number
  declare engineVersion: string
  declare body: TriageSnapshot
  declare score: number
  declare computedAt: CreationOptional<Date>
}

export class CaseRatingModel extends Model<InferAttributes<CaseRatingModel>, InferCreationAttributes<CaseRatingModel>> {
  declare caseId: ForeignKey<CaseModel['id']>
  declare listenerId: ForeignKey<UserModel['id']>
  declare score: number
  declare comment: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare listener?: NonAttribute<UserModel>
  declare case?: NonAttribute<CaseModel>
}

export function initCases(sequelize: Sequelize) {
  const status = DataTypes.ENUM(...caseStatuses)
  CaseModel.init(
    {
      id: appUuidKey(),
      roomRevision: required(DataTypes.INTEGER),
      title: required(DataTypes.STRING(160)),
      description: required(DataTypes.TEXT, ''),
      answers: required(DataTypes.JSONB, {}),
      status: required(status, 'draft'),
      score: optional(DataTypes.REAL),
      flagIds: required(DataTypes.ARRAY(DataTypes.TEXT), []),
      flags: required(DataTypes.JSONB, []),
      replyToken: { type: DataTypes.STRING(64), allowNull: false, unique: true },
      submittedAt: maybeAt(),
      waitingSince: maybeAt(),
      firstResponseAt: maybeAt(),
      closedAt: maybeAt(),
      lastActivityAt: stampNow(),
      ...timestamps(),
    },
    // `search` (a generated tsvector) is left out: only the queue's full-text SQL reads it.
    { sequelize, modelName: 'Case', tableName: 'cases', underscored: true, timestamps: false },
  )
  CaseEventModel.init(
    {
      id: serialKey(),
      kind: required(DataTypes.STRING(40)),
      fromStatus: optional(status),
      toStatus: optional(status),
      data: required(DataTypes.JSONB, {}),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'CaseEvent', tableName: 'case_events', underscored: true, timestamps: false },
  )
  TriageSnapshotModel.init(
    {
      id: serialKey(),
      roomRevision: required(DataTypes.INTEGER),
      engineVersion: required(DataTypes.STRING(40)),
      body: required(DataTypes.JSONB),
      score: required(DataTypes.REAL),
      computedAt: stampNow(),
    },
    { sequelize, modelName: 'TriageSnapshot', tableName: 'triage_snapshots', underscored: true, timestamps: false },
  )
  CaseRatingModel.init(
    {
      caseId: { type: DataTypes.UUID, primaryKey: true },
      score: { type: DataTypes.SMALLINT, allowNull: false, validate: { min: 1, max: 5 } },
      comment: required(DataTypes.TEXT, ''),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'CaseRating', tableName: 'case_ratings', underscored: true, timestamps: false },
  )
}
