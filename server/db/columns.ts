/**
 * Column pieces that the migrations (server/db/migrations, QueryInterface attribute options) and the
 * models (server/db/models, Model.init attributes) share, so that a column's type, nullability and
 * default read the same in both places.
 *
 * An applied migration's effect must never change, and the migrations call these: so never change what
 * one of them returns, not even to suit a model — add a new one instead. tests/api/schema-migrations.test.ts
 * fails if a fresh database differs from the committed snapshot (tests/fixtures/schema/schema.json).
 */
import { DataTypes, col, fn, literal, type DataType } from 'sequelize'
import { dbNow } from './models/now'

/** `DEFAULT now()`, evaluated by PostgreSQL at insert time. */
export const now = () => literal('now()')
/** `DEFAULT '{}'` for a jsonb object or an empty array column (a JS `{}` would be quoted as text). */
export const emptyLiteral = () => literal("'{}'")

/** `NOT NULL`, with a default when one is given (a JS value, or a literal / fn for SQL). */
export function required<T extends DataType | string>(type: T, defaultValue?: unknown) {
  return defaultValue === undefined ? { type, allowNull: false as const } : { type, allowNull: false as const, defaultValue }
}
/** Null allowed, no default. */
export const optional = <T extends DataType | string>(type: T) => ({ type, allowNull: true as const })

/** uuid primary key, `DEFAULT gen_random_uuid()` (migrations). */
export const uuidKey = () => ({ type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: literal('gen_random_uuid()') })
/** uuid primary key that the model generates in Node (UUIDV4) before the insert (models). */
export const appUuidKey = () => ({ type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 })
/** bigserial primary key (migrations and models). */
export const serialKey = () => ({ type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true })

/** timestamptz NOT NULL DEFAULT now() (migrations). */
export const stamp = () => ({ type: DataTypes.DATE, allowNull: false, defaultValue: now() })
/** timestamptz NOT NULL that the model fills with the database's clock (`dbNow()`) on insert (models). */
export const stampNow = () => ({ type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() })
/** A model's `createdAt` and `updatedAt`, both `stampNow()` (models with `timestamps: false`). */
export const timestamps = () => ({ createdAt: stampNow(), updatedAt: stampNow() })
/** timestamptz that may be null (no default). */
export const maybeAt = () => optional(DataTypes.DATE)

/** A uuid column referencing `table`(id); null allowed unless `notNull`. */
export const ref = (table: string, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT', notNull = false) =>
  ({ type: DataTypes.UUID, allowNull: !notNull, references: { model: table, key: 'id' }, onDelete })

/** A person's e-mail, name and role (models): a user's, and the same for the account a team invitation will become. */
export const personColumns = () => ({
  email: required(DataTypes.STRING(254)),
  name: required(DataTypes.STRING(120)),
  role: required(DataTypes.ENUM('listener', 'advisor', 'supervisor')),
})

/** An index key in descending order. */
export const desc = (name: string) => ({ name, order: 'DESC' as const })
/** The index expression `lower(column)`. */
export const lower = (column: string) => fn('lower', col(column))
