/**
 * The room's seams in its shared document, beside the frame:
 *
 * root map 'pattern':
 *   settings: Y.Map { warpAngle?, compensationWarp, compensationFill, seamAllowance, rollWidth }
 *   families: Y.Array<Y.Map { id, kind, …the family's fields (shared/pattern/families.ts) }>
 *
 * Each setting is its own key and each family its own Y.Map, so two people editing different
 * settings or families both win. A missing warpAngle follows the frame's prestress warp angle.
 * Reading never throws: any member can write any value anywhere, so the reader checks the shape
 * and answers a named error (field + reason) instead.
 */
import * as Y from 'yjs'
import { roomCutsSchema, type RoomCuts, type SeamFamily } from '../pattern/families'
import { fieldPath } from '../frame/parse-json'
import { newId } from './schema'

export const PATTERN_KEY = 'pattern'
export const DEFAULT_CUT_SETTINGS = { compensationWarp: 0, compensationFill: 0, seamAllowance: 0.05, rollWidth: 2.5 }

/** The root pattern map of a room document. */
export function patternMap(doc: Y.Doc): Y.Map<unknown> {
  return doc.getMap(PATTERN_KEY)
}

export type RoomCutsRead = { ok: true; cuts: RoomCuts } | { ok: false; field: string; message: string } | null

/** Plain value of a Y.Map or Y.Array (anything else as found, for the schema to judge). */
function plain(value: unknown): unknown {
  return value instanceof Y.Map || value instanceof Y.Array ? value.toJSON() : value
}

/**
 * The room's cuts, checked: null when there are no seams yet, else the cuts or a named error
 * (`pattern.families[2].spacing: …`). frameWarpAngle: the frame's prestress warp angle (degrees).
 */
export function readRoomCuts(doc: Y.Doc, frameWarpAngle = 0): RoomCutsRead {
  try {
    const root = patternMap(doc)
    const families = plain(root.get('families'))
    if (families === undefined || (Array.isArray(families) && families.length === 0)) return null
    const raw = plain(root.get('settings'))
    const s = (raw !== null && typeof raw === 'object' ? raw : {}) as Record<string, unknown>
    const value = (key: keyof typeof DEFAULT_CUT_SETTINGS) => (key in s ? s[key] : DEFAULT_CUT_SETTINGS[key])
    const candidate = {
      settings: {
        warpAngle: 'warpAngle' in s ? s.warpAngle : frameWarpAngle,
        compensation: { warp: value('compensationWarp'), fill: value('compensationFill') },
        seamAllowance: value('seamAllowance'),
        rollWidth: value('rollWidth'),
      },
      families,
    }
    const parsed = roomCutsSchema.safeParse(candidate)
    if (parsed.success) return { ok: true, cuts: parsed.data }
    const issue = parsed.error.issues[0]!
    // name the document's key: settings.compensation.warp is stored as settings.compensationWarp
    let field = fieldPath(issue.path)
    field = field.replace(
      /^settings\.compensation\.(warp|fill)/,
      (_, k: string) => `settings.compensation${k[0]!.toUpperCase()}${k.slice(1)}`,
    )
    return { ok: false, field: `pattern.${field}`, message: issue.message }
  } catch (err) {
    return {
      ok: false,
      field: 'pattern',
      message: `cannot be read (${err instanceof Error ? err.message : String(err)})`,
    }
  }
}

/** The families array, created on first use. */
function familiesOf(doc: Y.Doc): Y.Array<Y.Map<unknown>> {
  const root = patternMap(doc)
  let families = root.get('families')
  if (!(families instanceof Y.Array)) {
    families = new Y.Array<Y.Map<unknown>>()
    root.set('families', families)
  }
  return families as Y.Array<Y.Map<unknown>>
}

type NewFamily = SeamFamily extends infer F ? (F extends SeamFamily ? Omit<F, 'id'> : never) : never

/** Adds a seam family; returns its id. */
export function addSeamFamily(doc: Y.Doc, family: NewFamily, origin?: unknown): string {
  const id = newId('s')
  doc.transact(() => {
    const m = new Y.Map<unknown>()
    m.set('id', id)
    for (const [k, v] of Object.entries(family)) m.set(k, v)
    familiesOf(doc).push([m])
  }, origin)
  return id
}

/** Changes fields of a family (not its kind). False when a peer removed it. */
export function updateSeamFamily(
  doc: Y.Doc,
  id: string,
  patch: Record<string, number | number[]>,
  origin?: unknown,
): boolean {
  const m = familiesOf(doc)
    .toArray()
    .find((f) => f instanceof Y.Map && f.get('id') === id)
  if (!m) return false
  doc.transact(() => {
    for (const [k, v] of Object.entries(patch)) if (k !== 'id' && k !== 'kind') m.set(k, v)
  }, origin)
  return true
}

/** Removes a family. False when it was already gone. */
export function removeSeamFamily(doc: Y.Doc, id: string, origin?: unknown): boolean {
  const families = familiesOf(doc)
  const index = families.toArray().findIndex((f) => f instanceof Y.Map && f.get('id') === id)
  if (index < 0) return false
  doc.transact(() => families.delete(index, 1), origin)
  return true
}

/** Sets cut settings (any of them; warpAngle null = follow the frame). */
export function setCutSettings(
  doc: Y.Doc,
  patch: Partial<Record<keyof typeof DEFAULT_CUT_SETTINGS, number>> & { warpAngle?: number | null },
  origin?: unknown,
): void {
  doc.transact(() => {
    const root = patternMap(doc)
    let settings = root.get('settings')
    if (!(settings instanceof Y.Map)) {
      settings = new Y.Map<unknown>()
      root.set('settings', settings)
    }
    const m = settings as Y.Map<unknown>
    for (const [k, v] of Object.entries(patch)) {
      if (v === null) m.delete(k)
      else if (v !== undefined) m.set(k, v)
    }
  }, origin)
}
