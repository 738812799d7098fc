import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import type { Room, RoomRecord, RoomSummary } from '../../shared/schemas/room'

type Row = { id: string; owner_id: string; current_revision: number; created_at: Date; updated_at: Date; body: Room; revisions?: number[] }

const toRecord = (r: Row): RoomRecord => ({
  id: r.id,
  ownerId: r.owner_id,
  revision: r.current_revision,
  revisions: r.revisions ?? [r.current_revision],
  room: r.body,
  createdAt: new Date(r.created_at).toISOString(),
  updatedAt: new Date(r.updated_at).toISOString(),
})

export async function insertRoom(ownerId: string, room: Room, t?: Transaction): Promise<RoomRecord> {
  const [row] = await db().query<{ id: string }>(
    'INSERT INTO rooms (owner_id, name) VALUES ($1, $2) RETURNING id',
    { bind: [ownerId, room.name], type: QueryTypes.SELECT, transaction: t },
  )
  await db().query('INSERT INTO room_revisions (room_id, revision, body, created_by) VALUES ($1, 1, $2, $3)', {
    bind: [row.id, JSON.stringify(room), ownerId],
    transaction: t,
  })
  return (await findRoom(row.id, undefined, t))!
}

/** The room at `revision` (default: its current one), with the list of its revisions. */
export async function findRoom(id: string, revision?: number, t?: Transaction): Promise<RoomRecord | null> {
  const rows = await db().query<Row>(
    `SELECT r.id, r.owner_id, COALESCE($2::int, r.current_revision) AS current_revision, r.created_at, r.updated_at, rr.body,
            (SELECT array_agg(revision ORDER BY revision) FROM room_revisions WHERE room_id = r.id) AS revisions
       FROM rooms r JOIN room_revisions rr ON rr.room_id = r.id AND rr.revision = COALESCE($2::int, r.current_revision)
      WHERE r.id = $1`,
    { bind: [id, revision ?? null], type: QueryTypes.SELECT, transaction: t },
  )
  return rows[0] ? toRecord(rows[0]) : null
}

/** Stores a new revision; the row lock keeps two concurrent saves from taking the same number. */
export async function addRoomRevision(id: string, room: Room, userId: string, t: Transaction): Promise<RoomRecord> {
  const [locked] = await db().query<{ current_revision: number }>('SELECT current_revision FROM rooms WHERE id = $1 FOR UPDATE', {
    bind: [id], type: QueryTypes.SELECT, transaction: t,
  })
  const next = locked.current_revision + 1
  await db().query('INSERT INTO room_revisions (room_id, revision, body, created_by) VALUES ($1, $2, $3, $4)', {
    bind: [id, next, JSON.stringify(room), userId], transaction: t,
  })
  await db().query('UPDATE rooms SET current_revision = $2, name = $3, updated_at = now() WHERE id = $1', {
    bind: [id, next, room.name], transaction: t,
  })
  return (await findRoom(id, undefined, t))!
}

export async function listRooms(ownerId: string): Promise<RoomSummary[]> {
  const rows = await db().query<{ id: string; name: string; current_revision: number; body: Room; updated_at: Date }>(
    `SELECT r.id, r.name, r.current_revision, rr.body, r.updated_at
       FROM rooms r JOIN room_revisions rr ON rr.room_id = r.id AND rr.revision = r.current_revision
      WHERE r.owner_id = $1 ORDER BY r.updated_at DESC`,
    { bind: [ownerId], type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    id: r.id, name: r.name, revision: r.current_revision, length: r.body.length, width: r.body.width, height: r.body.height,
    updatedAt: new Date(r.updated_at).toISOString(),
  }))
}
