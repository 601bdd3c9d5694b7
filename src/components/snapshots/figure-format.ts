import type { SnapshotFigures } from '../../api/team'
import { cableName } from '../../../shared/report'

/** Number with fixed decimals and a unit, "—" for a missing or non-finite value. */
export function fmt(value: number | null | undefined, unit: string, decimals = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return unit ? `${value.toFixed(decimals)} ${unit}` : value.toFixed(decimals)
}

/** The headline figures of a snapshot as label/value rows (snapshot detail, printed report). */
export function figureRows(f: Readonly<SnapshotFigures>): { label: string; value: string }[] {
  const rows = [
    { label: 'Fabric area', value: fmt(f.area, 'm²') },
    { label: 'Plan area', value: fmt(f.planArea, 'm²') },
    { label: 'Perimeter', value: fmt(f.perimeter, 'm') },
    { label: 'Height range', value: `${fmt(f.heightRange[0], '')} … ${fmt(f.heightRange[1], 'm')}` },
    { label: 'Slope range', value: `${fmt(f.slopeRange[0], '', 1)} … ${fmt(f.slopeRange[1], '°', 1)}` },
    { label: 'Flat share (ponding / flutter risk)', value: fmt(f.flatShare * 100, '%', 1) },
  ]
  for (const c of f.cables ?? []) {
    rows.push({
      label: `Cable ${cableName(c)} (length, prestress-state force)`,
      value: `${fmt(c.length, 'm')}, ${fmt(c.force, 'kN', 1)}`,
    })
  }
  if (!f.cables && f.cableCount !== undefined) rows.push({ label: 'Cable edges', value: String(f.cableCount) })
  return rows
}
