/**
 * Flat patterns as ASCII DXF (AutoCAD R12 subset: POLYLINE, LINE, TEXT; metres, $INSUNITS 6).
 * Layers: CUT (cut line with seam allowance), OUTLINE (compensated outline), LABEL, WARP (arrow
 * along the warp, i.e. along the roll), NOTE (the caution). One closed polyline per line.
 */
import type { PatternResult } from '../pattern/types'
import { layoutStrips } from './pattern-layout'

function num(x: number): string {
  return Number.isInteger(x) ? `${x}.0` : x.toFixed(6)
}

function pairs(...items: (string | number)[]): string[] {
  const out: string[] = []
  for (let i = 0; i < items.length; i += 2)
    out.push(String(items[i]), typeof items[i + 1] === 'number' ? num(items[i + 1] as number) : String(items[i + 1]))
  return out
}

function polyline(layer: string, points: readonly (readonly [number, number])[], du: number, dv: number): string[] {
  const out = pairs(0, 'POLYLINE', 8, layer, 66, '1', 70, '1', 10, 0, 20, 0, 30, 0)
  for (const [u, v] of points) out.push(...pairs(0, 'VERTEX', 8, layer, 10, u + du, 20, v + dv, 30, 0))
  out.push(...pairs(0, 'SEQEND', 8, layer))
  return out
}

function line(layer: string, a: readonly [number, number], b: readonly [number, number]): string[] {
  return pairs(0, 'LINE', 8, layer, 10, a[0], 20, a[1], 30, 0, 11, b[0], 21, b[1], 31, 0)
}

function text(layer: string, at: readonly [number, number], height: number, value: string): string[] {
  // DXF text is one line of plain characters; group codes are line-based, so strip line breaks
  return pairs(0, 'TEXT', 8, layer, 10, at[0], 20, at[1], 30, 0, 40, height, 1, value.replace(/[\r\n]+/g, ' '))
}

/** Warp arrow: a shaft along +u with two head strokes, `length` m long, centred on `at`. */
export function warpArrow(at: readonly [number, number], length: number): [[number, number], [number, number]][] {
  const a: [number, number] = [at[0] - length / 2, at[1]],
    b: [number, number] = [at[0] + length / 2, at[1]]
  const h = length / 5
  return [
    [a, b],
    [b, [b[0] - h, b[1] + h / 2]],
    [b, [b[0] - h, b[1] - h / 2]],
  ]
}

/** The whole pattern as DXF text (CRLF line ends, as most readers expect). */
export function patternToDxf(pattern: Readonly<PatternResult>, title = 'Veilroom cutting pattern'): string {
  const { placed, size } = layoutStrips(pattern.strips)
  const out: string[] = [...pairs(999, `${title}; metres; warp along +x (roll length)`, 999, pattern.caution)]
  out.push(...pairs(0, 'SECTION', 2, 'HEADER', 9, '$ACADVER', 1, 'AC1009', 9, '$INSUNITS', 70, '6', 0, 'ENDSEC'))
  out.push(...pairs(0, 'SECTION', 2, 'ENTITIES'))
  for (const { strip, du, dv, labelAt } of placed) {
    out.push(...polyline('CUT', strip.cutLine, du, dv), ...polyline('OUTLINE', strip.outline, du, dv))
    const height = Math.min(0.2, Math.max(0.02, strip.width / 6))
    out.push(...text('LABEL', [labelAt[0], labelAt[1] + height], height, strip.id))
    for (const [a, b] of warpArrow([labelAt[0], labelAt[1] - height], Math.min(1, strip.length / 4)))
      out.push(...line('WARP', a, b))
  }
  out.push(...text('NOTE', [0, -0.3], 0.1, pattern.caution))
  out.push(...text('NOTE', [0, size[1] + 0.2], 0.1, `${title} (m)`))
  out.push(...pairs(0, 'ENDSEC', 0, 'EOF'))
  return out.join('\r\n') + '\r\n'
}
