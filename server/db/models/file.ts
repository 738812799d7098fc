import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { FileKind } from '../../../shared/schemas/case'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import type { MessageModel } from './message'
import { dbNow } from './now'

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
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      originalName: { type: DataTypes.STRING(255), allowNull: false },
      mime: { type: DataTypes.STRING(100), allowNull: false },
      size: { type: DataTypes.BIGINT, allowNull: false },
      storageKey: { type: DataTypes.STRING(255), allowNull: false },
      thumbKey: { type: DataTypes.STRING(255), allowNull: true },
      analysisStatus: { type: DataTypes.STRING(10), allowNull: true },
      analysis: { type: DataTypes.JSONB, allowNull: true },
      analysisError: { type: DataTypes.TEXT, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'File', tableName: 'files', underscored: true, timestamps: false },
  )
}
