/**
 * A printable cutting sheet (one HTML document): the caution first, settings, one row per strip,
 * the seams with their mismatch, and the drawing. The browser prints it (print styles inline).
 */
import type { CutSettings, PatternResult } from '../pattern/types'
import { escapeXml, patternToSvg } from './pattern-svg'

const m = (x: number, digits = 3) => x.toFixed(digits)
const pct = (x: number) => (100 * x).toFixed(2)
/** S12 → 12: each seam is listed once, from its lower-numbered strip. */
const stripNumber = (id: string) => Number(id.slice(1))

/** HTML text of the cutting sheet. title: room name or file name (escaped here). */
export function cuttingSheetHtml(
  pattern: Readonly<PatternResult>,
  settings: Readonly<Omit<CutSettings, 'seams'>>,
  title: string,
  when = new Date(),
): string {
  const rows = pattern.strips
    .map(
      (s) =>
        `<tr${s.overWidth ? ' class="over"' : ''}><td>${escapeXml(s.id)}</td><td>${m(s.area3d)}</td><td>${m(s.areaFlat)}</td><td>${m(s.length)}</td><td>${m(s.width)}${s.overWidth ? ' (over roll width)' : ''}</td><td>${pct(s.strain.maxWarp)}</td><td>${pct(s.strain.maxFill)}</td><td>${pct(s.strain.rms)}</td></tr>`,
    )
    .join('\n')
  const seams = pattern.strips
    .flatMap((s) => s.seams.filter((x) => stripNumber(x.with) > stripNumber(s.id)).map((x) => ({ a: s.id, ...x })))
    .map(
      (x) =>
        `<tr><td>${escapeXml(x.a)} | ${escapeXml(x.with)}</td><td>${m(x.length3d)}</td><td>${m(x.lengthFlat)}</td><td>${(1000 * x.mismatch).toFixed(1)}</td></tr>`,
    )
    .join('\n')
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${escapeXml(title)} — cutting sheet</title>
<style>
body { font: 11pt system-ui, sans-serif; margin: 12mm; color: #111 }
.caution { border: 2px solid #b5452b; padding: 6px 10px; font-weight: 600 }
table { border-collapse: collapse; margin: 8px 0 }
td, th { border: 1px solid #999; padding: 2px 6px; text-align: right }
td:first-child, th:first-child { text-align: left }
tr.over td { background: #fde2d8 }
svg { max-width: 100%; height: auto }
@media print { .no-print { display: none } }
</style></head><body>
<h1>${escapeXml(title)} — cutting sheet</h1>
<p class="caution">${escapeXml(pattern.caution)}</p>
<p>Made ${escapeXml(when.toISOString().slice(0, 16).replace('T', ' '))} UTC. Warp angle ${settings.warpAngle}° in plan; compensation warp ${settings.compensation.warp} %, fill ${settings.compensation.fill} %; seam allowance ${m(settings.seamAllowance)} m; roll width ${m(settings.rollWidth)} m. Lengths in m, areas in m², strains in %.</p>
<table><thead><tr><th>strip</th><th>3D area</th><th>flat area</th><th>length</th><th>width</th><th>max warp strain</th><th>max fill strain</th><th>RMS strain</th></tr></thead>
<tbody>
${rows}
</tbody></table>
<h2>Seams</h2>
<table><thead><tr><th>strips</th><th>3D length</th><th>flat length (first side)</th><th>mismatch (mm)</th></tr></thead>
<tbody>
${seams}
</tbody></table>
<h2>Drawing</h2>
${patternToSvg(pattern, title)}
<p class="caution">${escapeXml(pattern.caution)}</p>
</body></html>
`
}
