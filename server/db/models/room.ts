import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Room } from '../../../shared/schemas/room'
import type { UserModel } from './user'
import { appUuidKey, required, stampNow, timestamps } from '../columns'

export class RoomModel extends Model<InferAttributes<RoomModel>, InferCreationAttributes<RoomModel>> {
  declare id: CreationOptional<string>
  declare ownerId: ForeignKey<UserModel['id']>
  declare name: string
  declare currentRevision: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare revisions?: NonAttribute<RoomRevisionModel[]>
  declare current?: NonAttribute<RoomRevisionModel>
  declare owner?: NonAttribute<UserModel>
}

export class RoomRevisionModel extends Model<InferAttributes<RoomRevisionModel>, InferCreationAttributes<RoomRevisionModel>> {
  declare roomId: ForeignKey<RoomModel['id']>
  declare revision: number
  declare body: Room
  declare createdBy: ForeignKey<UserModel['id']> | null
  declare createdAt: CreationOptional<Date>
  declare room?: NonAttribute<RoomModel>
}

export function initRooms(sequelize: Sequelize) {
  RoomModel.init(
    {
      id: appUuidKey(),
      name: required(DataTypes.STRING(120)),
      currentRevision: required(DataTypes.INTEGER, 1),
      ...timestamps(),
    },
    { sequelize, modelName: 'Room', tableName: 'rooms', underscored: true, timestamps: false },
  )
  RoomRevisionModel.init(
    {
      roomId: { type: DataTypes.UUID, primaryKey: true },
      revision: { type: DataTypes.INTEGER, primaryKey: true },
      body: required(DataTypes.JSONB),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'RoomRevision', tableName: 'room_revisions', underscored: true, timestamps: false },
  )
}
