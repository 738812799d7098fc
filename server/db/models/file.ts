import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { FileKind } from '../../../shared/schemas/case'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import type { MessageModel } from './message'
import { appUuidKey, optional, required, stampNow } from '../columns'

export type AnalysisStatus = 'queued' | 'running' | 'done' | 'failed'

export class FileModel extends Model<InferAttributes<FileModel>, InferCreationAttributes<FileModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare uploaderId: ForeignKey<UserModel['id']> | null
  declare messageId: CreationOptional<ForeignKey<MessageModel['id']> | null>
  declare kind: FileKind
  declare originalName: string
  declare mime: string
  /** bigint: node-postgres returns it as a string. */
  declare size: number | string
  declare storageKey: string
  declare thumbKey: string | null
  declare analysisStatus: AnalysisStatus | null
  declare analysis: CreationOptional<unknown>
  declare analysisError: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare message?: NonAttribute<MessageModel | null>
}

export function initFiles(sequelize: Sequelize) {
  FileModel.init(
    {
      id: appUuidKey(),
      kind: required(DataTypes.STRING(20)),
      originalName: required(DataTypes.STRING(255)),
      mime: required(DataTypes.STRING(100)),
      size: required(DataTypes.BIGINT),
      storageKey: required(DataTypes.STRING(255)),
      thumbKey: optional(DataTypes.STRING(255)),
      analysisStatus: optional(DataTypes.STRING(10)),
      analysis: optional(DataTypes.JSONB),
      analysisError: optional(DataTypes.TEXT),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'File', tableName: 'files', underscored: true, timestamps: false },
  )
}
