/** Figures as CSV `figure,value,unit` rows (one row per number), with the caution as a comment. */
import type { Figures } from '../types'

function cell(s: string | number): string {
  const t = String(s)
  return /[",\n]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t
}

export function figuresToCsv(f: Readonly<Figures>): string {
  const rows: [string, number, string][] = [
    ['area', f.area, 'm2'],
    ['plan area', f.planArea, 'm2'],
    ['perimeter', f.perimeter, 'm'],
    ['height min', f.heightRange[0], 'm'],
    ['height max', f.heightRange[1], 'm'],
    ['slope min', f.slopeRange[0], 'deg'],
    ['slope max', f.slopeRange[1], 'deg'],
    ['flat threshold', f.flatThreshold, 'deg'],
    ['flat share', f.flatShare, '1'],
    ['anticlastic share', f.anticlasticShare, '1'],
    ['ponding pockets', f.pondingPockets.length, 'count'],
    ['solver residual', f.residual, '1'],
    ['min angle', f.minAngle, 'deg'],
  ]
  f.cables.forEach((c) => {
    rows.push([`cable loop ${c.loop} edge ${c.edge} length`, c.length, 'm'])
    rows.push([`cable loop ${c.loop} edge ${c.edge} force`, c.force, 'kN'])
    rows.push([`cable loop ${c.loop} edge ${c.edge} sag`, c.sag, 'm'])
  })
  f.pondingPockets.forEach((p, i) => {
    rows.push([`pocket ${i + 1} x`, p.x, 'm'], [`pocket ${i + 1} y`, p.y, 'm'], [`pocket ${i + 1} z`, p.z, 'm'])
    rows.push([`pocket ${i + 1} ponded plan area`, p.area, 'm2'])
  })
  f.reactions.forEach(([l, p, fx, fy, fz]) => {
    rows.push([`frame point loop ${l} point ${p} fx`, fx, 'kN'], [`frame point loop ${l} point ${p} fy`, fy, 'kN'], [`frame point loop ${l} point ${p} fz`, fz, 'kN'])
  })
  f.slopeHistogram.shares.forEach((s, i) => {
    rows.push([`slope ${f.slopeHistogram.edges[i]}-${f.slopeHistogram.edges[i + 1]} deg share`, s, '1'])
  })
  const lines = [
    '# Form-finding figures are preliminary: loads, stresses, ponding under load, patterning, anchors and connections are checked by a qualified engineer under local codes.',
    'figure,value,unit',
    ...rows.map(([a, b, c]) => [cell(a), cell(b), cell(c)].join(',')),
  ]
  return lines.join('\n') + '\n'
}
