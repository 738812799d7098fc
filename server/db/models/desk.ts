import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { BusinessHours } from '../../../shared/schemas/metrics'
import type { SavedFilterInput } from '../../../shared/schemas/queue'
import type { UserModel } from './user'
import { appUuidKey, maybeAt, optional, required, stampNow, timestamps } from '../columns'

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
      id: appUuidKey(),
      title: required(DataTypes.STRING(80)),
      body: required(DataTypes.TEXT),
      scope: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'personal', validate: { isIn: [['personal', 'team']] } },
      ...timestamps(),
    },
    { sequelize, modelName: 'ReplySnippet', tableName: 'reply_snippets', underscored: true, timestamps: false },
  )
  SavedFilterModel.init(
    {
      id: appUuidKey(),
      name: required(DataTypes.STRING(60)),
      query: required(DataTypes.JSONB),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'SavedFilter', tableName: 'saved_filters', underscored: true, timestamps: false },
  )
  DeskSettingsModel.init(
    {
      id: { type: DataTypes.SMALLINT, primaryKey: true, defaultValue: 1 },
      firstResponseHours: required(DataTypes.DOUBLE, 24),
      resolutionHours: required(DataTypes.DOUBLE, 120),
      warnAtPercent: required(DataTypes.INTEGER, 75),
      timeZone: optional(DataTypes.STRING(64)),
      week: optional(DataTypes.JSONB),
      updatedAt: maybeAt(),
    },
    { sequelize, modelName: 'DeskSettings', tableName: 'desk_settings', underscored: true, timestamps: false },
  )
}
