import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import { required } from '../columns'

/** One rate-limit counter (migration 0090): `key` is the limiter's name and a SHA-256 of the client key. */
export class RateLimitHitModel extends Model<InferAttributes<RateLimitHitModel>, InferCreationAttributes<RateLimitHitModel>> {
  declare key: string
  declare hits: number
  declare resetAt: Date
}

export function initRateLimit(sequelize: Sequelize): void {
  RateLimitHitModel.init(
    {
      key: { type: DataTypes.STRING(100), primaryKey: true, allowNull: false },
      hits: required(DataTypes.INTEGER, 0),
      resetAt: required(DataTypes.DATE),
    },
    { sequelize, tableName: 'rate_limit_hits', underscored: true, timestamps: false },
  )
}
