import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

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
      hits: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      resetAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'rate_limit_hits', underscored: true, timestamps: false },
  )
}
