/**
 * A report table: what the printed report shows and the figures CSV writes, from one definition so
 * a spreadsheet user gets what the page shows.
 */

/** A number, a text, or null for "not applicable" (shown as "—", left empty in the CSV). */
export type Cell = string | number | null

export interface Column {
  label: string
  /** Unit shown in the header, e.g. "m", "kN", "°". */
  unit?: string
  /** Decimals for numbers in this column (default 2); 'exp' writes 3 significant digits as 1.23e-8. */
  digits?: number | 'exp'
  /** Free text (comments, replies): may break anywhere and takes the room left by the other columns. */
  text?: boolean
}

export interface ReportTable {
  /** Stable key for tests and CSV section names. */
  key: string
  title: string
  /** What the numbers are (e.g. "prestress state"), printed under the title and in the CSV. */
  note?: string
  columns: Column[]
  rows: Cell[][]
}

/** A cell as text: numbers with the column's decimals (−0 as 0), null as "—". */
export function formatCell(cell: Cell, column: Readonly<Column>): string {
  if (cell === null) return '—'
  if (typeof cell === 'string') return cell
  if (!Number.isFinite(cell)) return '—'
  const digits = column.digits ?? 2
  if (digits === 'exp') return cell.toExponential(2)
  const text = cell.toFixed(digits)
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text
}

/** Header text of a column: "x (m)". */
export const columnHeader = (c: Readonly<Column>): string => (c.unit ? `${c.label} (${c.unit})` : c.label)
