/**
 * Typed edits from the side panel (coordinates, edge tension, settings), checked before they reach
 * the shared document so a bad number is refused here with a message naming the field. The server's
 * frame validator still has the last word (self-crossing loops, holes outside the outer loop).
 */
import { reactive } from 'vue'
import { useWorkbenchStore } from '../stores/workbench'
import type { PointRow } from '../lib/frame-view'

/** Largest coordinate accepted from the keyboard, m; a typo of extra digits should not fly off. */
export const COORDINATE_LIMIT = 10_000

/** What a typed number must be besides finite: within [min, max], and above 0 when `positive`. */
export interface NumberLimits {
  min?: number
  max?: number
  positive?: boolean
}

/**
 * Checks a typed number: finite, and within the limits when given. Returns an error message naming
 * the field, or undefined when the value is fine.
 */
export function checkNumber(field: string, value: number | null, opts: NumberLimits = {}): string | undefined {
  if (value === null || !Number.isFinite(value)) return `${field}: enter a number.`
  if (opts.positive && !(value > 0)) return `${field}: must be greater than 0.`
  if (opts.min !== undefined && value < opts.min) return `${field}: must be at least ${opts.min}.`
  if (opts.max !== undefined && value > opts.max) return `${field}: must be at most ${opts.max}.`
  return undefined
}

/** Coordinate edits from the points table. */
export function useCoordinateEdit() {
  const store = useWorkbenchStore()
  const errors = reactive<Record<string, string>>({})

  /** Sets x, y or z (m) of a point, or shows why not. */
  function setCoordinate(row: PointRow, axis: 'x' | 'y' | 'z', value: number | null): void {
    const key = `${row.key}/${axis}`
    const error = checkNumber(`${row.name} ${axis}`, value, {
      min: -COORDINATE_LIMIT,
      max: COORDINATE_LIMIT,
    })
    if (error) {
      errors[key] = error
      return
    }
    delete errors[key]
    store.stopCapturing()
    store.move(row.loopId, row.id, { [axis]: value })
  }

  return { errors, setCoordinate }
}
