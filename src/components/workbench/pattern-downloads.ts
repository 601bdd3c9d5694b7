/**
 * The pattern downloads, made in the browser from the last `pattern` message with the same
 * shared writers the CLI uses (DXF, SVG, the printable cutting sheet); each carries the caution.
 */
import { cuttingSheetHtml, patternToDxf, patternToSvg } from '../../../shared/export'
import type { PatternEvent } from '../../../shared/protocol'

function save(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }))
  const a = document.createElement('a')
  a.href = url
  a.download = name
  a.click()
  setTimeout(() => URL.revokeObjectURL(url), 1000)
}

/** Saves the pattern as DXF or SVG; `title` names the room in the file. */
export function downloadPattern(p: PatternEvent, kind: 'dxf' | 'svg', title: string): void {
  if (!p.result) return
  const stem = `${title.replace(/[^\w-]+/g, '-').toLowerCase() || 'pattern'}-v${p.version}`
  if (kind === 'dxf') save(`${stem}.dxf`, patternToDxf(p.result, title), 'application/dxf')
  else save(`${stem}.svg`, patternToSvg(p.result, title), 'image/svg+xml')
}

/** Opens the cutting sheet in a new window and asks the browser to print it. */
export function printCuttingSheet(p: PatternEvent, title: string): void {
  if (!p.result) return
  const html = cuttingSheetHtml(p.result, p.settings, title)
  const url = URL.createObjectURL(new Blob([html], { type: 'text/html' }))
  const w = window.open(url, '_blank')
  w?.addEventListener('load', () => w.print())
  setTimeout(() => URL.revokeObjectURL(url), 60_000)
}
