/**
 * The figures CSV: the printed report's tables, one section per table (a "# title" line, an
 * optional "# note" line, a header row, the rows, a blank line), numbered as the workbench numbers
 * points and edges. Cells are the report's own text, so a spreadsheet user reads what the page shows.
 */
import { columnHeader, formatCell, reportTables, type ReportInput, type ReportTable } from '../report'

function cell(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

/**
 * A text cell (a pin's comment, a name, a header). Text a spreadsheet would run as a formula
 * (leading = + - @, or a tab or CR) gets a leading apostrophe, as OWASP's "CSV Injection" page
 * advises. Numbers go through cell() alone, so "-0.25" stays a number.
 */
export function csvText(s: string): string {
  return cell(/^[=+\-@\t\r]/.test(s) ? `'${s}` : s)
}

/** One table as CSV lines; "not applicable" cells are left empty. */
export function tableToCsv(t: Readonly<ReportTable>): string[] {
  const lines = [`# ${t.title}`]
  if (t.note) lines.push(`# ${t.note}`)
  lines.push(t.columns.map((c) => csvText(columnHeader(c))).join(','))
  for (const row of t.rows) {
    lines.push(
      row
        .map((v, i) => (v === null ? '' : typeof v === 'string' ? csvText(v) : cell(formatCell(v, t.columns[i]!))))
        .join(','),
    )
  }
  return lines
}

/** Every report table, the caution first as comment lines (anyone may build from this file alone). */
export function figuresToCsv(input: Readonly<ReportInput>, caution: string): string {
  const sections = reportTables(input).map((t) => tableToCsv(t).join('\n'))
  return [`# ${caution}`, ...sections].join('\n\n') + '\n'
}
