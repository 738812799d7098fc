import { capitalise } from '../../../shared/plan/names'
import type { UnitSystem } from '../../composables/useUnits'

/** Small helpers the room form's blocks share. */

/** The messages for one field of a row of a list (`openings.2.from`), empty when it is fine. */
export const rowErrors = (errors: Record<string, string[]>, path: string) => (index: number, field: string) => errors[`${path}.${index}.${field}`] ?? []


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
