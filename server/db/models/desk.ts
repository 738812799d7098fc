import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { BusinessHours } from '../../../shared/schemas/metrics'
import type { SavedFilterInput } from '../../../shared/schemas/queue'
import type { UserModel } from './user'
import { dbNow } from './now'

export class ReplySnippetModel extends Model<InferAttributes<ReplySnippetModel>, InferCreationAttributes<ReplySnippetModel>> {
  declare id: CreationOptional<string>
  declare title: string
  declare body: string
  /** `personal`: the author's alone; `team`: everyone's (migration 0050). */
  declare scope: CreationOptional<'personal' | 'team'>
  declare createdBy: ForeignKey<UserModel['id']> | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare author?: NonAttribute<UserModel | null>
}

export class SavedFilterModel extends Model<InferAttributes<SavedFilterModel>, InferCreationAttributes<SavedFilterModel>> {
  declare id: CreationOptional<string>
  declare userId: ForeignKey<UserModel['id']>
  declare name: string
  declare query: SavedFilterInput['query']
  declare createdAt: CreationOptional<Date>
}

/** The desk's one settings row (id 1): response targets and business hours. */
export class DeskSettingsModel extends Model<InferAttributes<DeskSettingsModel>, InferCreationAttributes<DeskSettingsModel>> {
  declare id: CreationOptional<number>
  declare firstResponseHours: CreationOptional<number>
  declare resolutionHours: CreationOptional<number>
  declare warnAtPercent: CreationOptional<number>
  declare timeZone: string | null
  declare week: BusinessHours['week'] | null
  declare updatedAt: Date | null
  declare updatedBy: ForeignKey<UserModel['id']> | null
  declare editor?: NonAttribute<UserModel | null>
}

export function initDesk(sequelize: Sequelize) {
  ReplySnippetModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      title: { type: DataTypes.STRING(80), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      scope: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'personal', validate: { isIn: [['personal', 'team']] } },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
      updatedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'ReplySnippet', tableName: 'reply_snippets', underscored: true, timestamps: false },
  )
  SavedFilterModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      name: { type: DataTypes.STRING(60), allowNull: false },
      query: { type: DataTypes.JSONB, allowNull: false },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'SavedFilter', tableName: 'saved_filters', underscored: true, timestamps: false },
  )
  DeskSettingsModel.init(
    {
      id: { type: DataTypes.SMALLINT, primaryKey: true, defaultValue: 1 },
      firstResponseHours: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 24 },
      resolutionHours: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 120 },
      warnAtPercent: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 75 },
      timeZone: { type: DataTypes.STRING(64), allowNull: true },
      week: { type: DataTypes.JSONB, allowNull: true },
      updatedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, modelName: 'DeskSettings', tableName: 'desk_settings', underscored: true, timestamps: false },
  )
}
