import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { PlanBody } from '../../../shared/schemas/plan'
import type { PlanPredictions } from '../../../shared/plan'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import type { RoomModel } from './room'
import { appUuidKey, maybeAt, required, stampNow } from '../columns'

/** One saved version of a case's treatment plan; a trigger (migration 0020) keeps its content unchanged. */
export class TreatmentPlanModel extends Model<InferAttributes<TreatmentPlanModel>, InferCreationAttributes<TreatmentPlanModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare version: number
  declare roomId: ForeignKey<RoomModel['id']>
  declare roomRevision: number
  declare body: PlanBody
  declare predictions: PlanPredictions
  declare engineVersion: string
  declare createdBy: ForeignKey<UserModel['id']> | null
  declare createdAt: CreationOptional<Date>
  declare sentAt: CreationOptional<Date | null>
  declare sentBy: CreationOptional<ForeignKey<UserModel['id']> | null>
  declare creator?: NonAttribute<UserModel | null>
  declare sender?: NonAttribute<UserModel | null>
}

export function initPlans(sequelize: Sequelize) {
  TreatmentPlanModel.init(
    {
      id: appUuidKey(),
      version: required(DataTypes.INTEGER),
      roomRevision: required(DataTypes.INTEGER),
      body: required(DataTypes.JSONB),
      predictions: required(DataTypes.JSONB),
      engineVersion: required(DataTypes.STRING(40)),
      createdAt: stampNow(),
      sentAt: maybeAt(),
    },
    { sequelize, modelName: 'TreatmentPlan', tableName: 'treatment_plans', underscored: true, timestamps: false },
  )
}
