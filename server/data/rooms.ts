import type { Transaction } from 'sequelize'
import { models, type RoomModel } from '../db/models'
import { dbNow } from '../db/models/now'
import type { Room, RoomRecord, RoomSummary } from '../../shared/schemas/room'

export async function insertRoom(ownerId: string, room: Room, t?: Transaction): Promise<RoomRecord> {
  const { Room: Rooms, RoomRevision } = models()
  const write = async (tx: Transaction) => {
    const r = await Rooms.create({ ownerId, name: room.name }, { transaction: tx })
    await RoomRevision.create({ roomId: r.id, revision: 1, body: room, createdBy: ownerId }, { transaction: tx })
    return r.id
  }
  // Two rows: in the caller's transaction, or in one of its own.
  const id = t ? await write(t) : await Rooms.sequelize!.transaction(write)
  return (await findRoom(id, undefined, t))!
}

/** The room at `revision` (default: its current one), with the list of its revisions. */
export async function findRoom(id: string, revision?: number, t?: Transaction): Promise<RoomRecord | null> {
  const { Room: Rooms, RoomRevision } = models()
  const r: RoomModel | null = await Rooms.findByPk(id, {
    include: [{ model: RoomRevision, as: 'revisions', attributes: ['revision'] }],
    order: [[{ model: RoomRevision, as: 'revisions' }, 'revision', 'ASC']],
    transaction: t,
  })
  if (!r) return null
  const at = revision ?? r.currentRevision
  const rev = await RoomRevision.findOne({ where: { roomId: id, revision: at }, transaction: t })
  if (!rev) return null
  return {
    id: r.id,
    ownerId: r.ownerId,
    revision: at,
    revisions: (r.revisions ?? []).map((x) => x.revision),
    room: rev.body,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  }
}

/** Stores a new revision; the row lock keeps two concurrent saves from taking the same number. */
export async function addRoomRevision(id: string, room: Room, userId: string, t: Transaction): Promise<RoomRecord> {
  const { Room: Rooms, RoomRevision } = models()
  const locked = await Rooms.findByPk(id, { attributes: ['id', 'currentRevision'], lock: t.LOCK.UPDATE, transaction: t })
  const next = locked!.currentRevision + 1
  await RoomRevision.create({ roomId: id, revision: next, body: room, createdBy: userId }, { transaction: t })
  await Rooms.update({ currentRevision: next, name: room.name, updatedAt: dbNow() }, { where: { id }, transaction: t })
  return (await findRoom(id, undefined, t))!
}

export async function listRooms(ownerId: string): Promise<RoomSummary[]> {
  const rows = await models().Room.scope('withCurrent').findAll({ where: { ownerId }, order: [['updatedAt', 'DESC']] })
  return rows.map((r) => {
    const body = r.current!.body
    return { id: r.id, name: r.name, revision: r.currentRevision, length: body.length, width: body.width, height: body.height, updatedAt: r.updatedAt.toISOString() }
  })
}
