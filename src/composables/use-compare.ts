/**
 * Figure differences between two snapshots, for the comparison table: B minus A, and B relative
 * to A where A is not zero. Cables are matched by loop and edge index and named as the workbench
 * names them ("Cable Outer E2", shared/report/numbering.ts).
 */
import type { SnapshotFigures } from '../api/team'
import { cableName } from '../../shared/report'

export interface FigureRow {
  key: string
  label: string
  unit: string
  a: number | null
  b: number | null
  /** b − a; null when either side lacks the figure. */
  diff: number | null
  /** (b − a) / |a|; null when a is (within 1e-9 of) 0 or missing. */
  relative: number | null
}

function row(
  key: string,
  label: string,
  unit: string,
  a: number | null | undefined,
  b: number | null | undefined,
): FigureRow {
  const av = a ?? null
  const bv = b ?? null
  const diff = av !== null && bv !== null ? bv - av : null
  // A relative change of a figure that is (numerically) zero, e.g. the slope of a flat sail, says nothing.
  const relative = diff !== null && av !== null && Math.abs(av) > 1e-9 ? diff / Math.abs(av) : null
  return { key, label, unit, a: av, b: bv, diff, relative }
}

/** One row per figure: areas, perimeter, height and slope ranges, flat share, cables. */
export function figureDifferences(a: Readonly<SnapshotFigures>, b: Readonly<SnapshotFigures>): FigureRow[] {
  const rows = [
    row('area', 'Fabric area', 'm²', a.area, b.area),
    row('planArea', 'Plan area', 'm²', a.planArea, b.planArea),
    row('perimeter', 'Perimeter', 'm', a.perimeter, b.perimeter),
    row('heightMin', 'Lowest point', 'm', a.heightRange[0], b.heightRange[0]),
    row('heightMax', 'Highest point', 'm', a.heightRange[1], b.heightRange[1]),
    row('slopeMin', 'Flattest slope', '°', a.slopeRange[0], b.slopeRange[0]),
    row('slopeMax', 'Steepest slope', '°', a.slopeRange[1], b.slopeRange[1]),
    row('flatShare', 'Flat share', '%', a.flatShare * 100, b.flatShare * 100),
  ]
  const count = (f: Readonly<SnapshotFigures>) => f.cables?.length ?? f.cableCount ?? null
  rows.push(row('cableCount', 'Cable edges', '', count(a), count(b)))
  const keyOf = (c: { loop: number; edge: number }) => `${c.loop}:${c.edge}`
  const ca = new Map((a.cables ?? []).map((c) => [keyOf(c), c]))
  const cb = new Map((b.cables ?? []).map((c) => [keyOf(c), c]))
  const keys = [...new Set([...ca.keys(), ...cb.keys()])].sort((x, y) => {
    const [lx, ex] = x.split(':').map(Number) as [number, number]
    const [ly, ey] = y.split(':').map(Number) as [number, number]
    return lx - ly || ex - ey
  })
  for (const k of keys) {
    const [loop, edge] = k.split(':').map(Number) as [number, number]
    const name = `Cable ${cableName({ loop, edge })}`
    rows.push(row(`cable${k}:length`, `${name}: length`, 'm', ca.get(k)?.length, cb.get(k)?.length))
    rows.push(row(`cable${k}:force`, `${name}: prestress-state force`, 'kN', ca.get(k)?.force, cb.get(k)?.force))
  }
  return rows
}

/** A difference as shown: sign always, fixed decimals, "—" when unknown. */
export function formatDiff(value: number | null, decimals = 2): string {
  if (value === null || !Number.isFinite(value)) return '—'
  const s = value.toFixed(decimals)
  return value > 0 ? `+${s}` : s === `-${(0).toFixed(decimals)}` ? (0).toFixed(decimals) : s
}
