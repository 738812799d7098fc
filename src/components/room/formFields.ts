import { capitalise } from '../../../shared/plan/names'
import type { UnitSystem } from '../../composables/useUnits'

/** Small helpers the room form's blocks share. */

/** One coordinate of a row of a list (an opening's `from`, a seat's `z`): the length field that edits it. */
export interface RowCoord<T> {
  key: { [K in keyof T]: T[K] extends number ? K : never }[keyof T] & string
  label: string
  hint?: string
  testid?: string
}

/** A select's items from a list of values and their names, the names capitalised. */
export const nameItems = <V extends string>(values: readonly V[], names: Partial<Record<string, string>>) =>
  values.map((value) => ({ value, title: capitalise(names[value] ?? value) }))

/** What every block of the room form is given: the user's unit, the messages per field path, and whether it is read only. */
export interface RoomBlockProps {
  units: UnitSystem
  /** messages per field path ('length', 'speakers.0.x', …) */
  errors?: Record<string, string[]>
  readonly?: boolean
}
/** and the blocks that place things in the room get its size */
export interface RoomPlacingProps extends RoomBlockProps {
  room: { length: number; width: number; height: number }
}
export const roomBlockDefaults = { errors: () => ({}), readonly: false }
