/**
 * Column and index pieces that the migrations in server/db/migrations share (QueryInterface attribute
 * options). An applied migration's effect must never change, so never change what one of these
 * returns: add a new one instead. tests/api/schema-migrations.test.ts fails if a fresh database
 * differs from the committed snapshot (tests/fixtures/schema/schema.json).
 */
import { DataTypes, col, fn, literal } from 'sequelize'

/** `DEFAULT now()`, evaluated by PostgreSQL at insert time. */
export const now = () => literal('now()')
/** `DEFAULT '{}'` for a jsonb object or an empty array column (a JS `{}` would be quoted as text). */
export const emptyLiteral = () => literal("'{}'")

/** uuid primary key, `DEFAULT gen_random_uuid()`. */
export const uuidKey = () => ({ type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: literal('gen_random_uuid()') })
/** bigserial primary key. */
export const serialKey = () => ({ type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true })

/** timestamptz NOT NULL DEFAULT now(). */
export const stamp = () => ({ type: DataTypes.DATE, allowNull: false, defaultValue: now() })
/** timestamptz that may be null (no default). */
export const maybeAt = () => ({ type: DataTypes.DATE, allowNull: true })

/** A uuid column referencing `table`(id); null allowed unless `notNull`. */
export const ref = (table: string, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT', notNull = false) =>
  ({ type: DataTypes.UUID, allowNull: !notNull, references: { model: table, key: 'id' }, onDelete })

/** An index key in descending order. */
export const desc = (name: string) => ({ name, order: 'DESC' as const })
/** The index expression `lower(column)`. */
export const lower = (column: string) => fn('lower', col(column))
