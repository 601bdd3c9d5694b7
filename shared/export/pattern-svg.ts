/**
 * Flat patterns as SVG: the same layout as the DXF, drawn in metres (1 user unit = 1 m, y up
 * turned to SVG's y down), cut lines solid, compensated outlines dashed, label and warp arrow per
 * strip, the caution under the drawing.
 */
import type { PatternResult } from '../pattern/types'
import { warpArrow } from './pattern-dxf'
import { layoutStrips } from './pattern-layout'

export function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!)
}

function path(points: readonly (readonly [number, number])[], du: number, dv: number, top: number): string {
  return (
    points.map(([u, v], i) => `${i ? 'L' : 'M'}${(u + du).toFixed(4)} ${(top - v - dv).toFixed(4)}`).join(' ') + ' Z'
  )
}

/** The whole pattern as an SVG document (width in mm at 1:scale, default 1:20). */
export function patternToSvg(pattern: Readonly<PatternResult>, title = 'Veilroom cutting pattern', scale = 20): string {
  const { placed, size } = layoutStrips(pattern.strips)
  const margin = 0.5
  const top = size[1]
  const width = size[0] + 2 * margin,
    height = size[1] + 2 * margin + 0.6
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${((1000 * width) / scale).toFixed(1)}mm" height="${((1000 * height) / scale).toFixed(1)}mm" viewBox="${-margin} ${-margin} ${width} ${height}">`,
    `<title>${escapeXml(title)}</title>`,
    `<desc>${escapeXml(pattern.caution)} Metres; warp along the horizontal (roll length).</desc>`,
    `<g fill="none" stroke-width="0.01">`,
  ]
  for (const { strip, du, dv, labelAt } of placed) {
    const h = Math.min(0.2, Math.max(0.02, strip.width / 6))
    parts.push(
      `<g data-strip="${escapeXml(strip.id)}">`,
      `<path d="${path(strip.cutLine, du, dv, top)}" stroke="#1d3b53"/>`,
      `<path d="${path(strip.outline, du, dv, top)}" stroke="#6b7f8e" stroke-dasharray="0.05 0.03"/>`,
      `<text x="${labelAt[0].toFixed(4)}" y="${(top - labelAt[1] - h).toFixed(4)}" font-size="${h.toFixed(3)}" fill="#1d3b53" stroke="none" text-anchor="middle">${escapeXml(strip.id)}</text>`,
      ...warpArrow([labelAt[0], labelAt[1] - h], Math.min(1, strip.length / 4)).map(
        ([a, b]) =>
          `<line x1="${a[0].toFixed(4)}" y1="${(top - a[1]).toFixed(4)}" x2="${b[0].toFixed(4)}" y2="${(top - b[1]).toFixed(4)}" stroke="#b5452b"/>`,
      ),
      `</g>`,
    )
  }
  parts.push(
    `</g>`,
    `<text x="0" y="${(top + 0.35).toFixed(4)}" font-size="0.08" fill="#222">${escapeXml(pattern.caution)}</text>`,
    `</svg>`,
  )
  return parts.join('\n') + '\n'
}
