/**
 * Starting frames offered when a room is created. Geometry is our own: round figures a designer
 * would sketch first, sized so that each settles at the default element size in well under a second.
 */
import type { Frame, FrameEdge, FrameLoop, FramePoint } from '../types'

export type StarterKey = 'sail' | 'tent' | 'arch' | 'cable-rectangle' | 'blank'

export const STARTERS: { key: StarterKey; label: string; description: string }[] = [
  { key: 'sail', label: 'Four-point sail', description: 'Hypar between two high and two low corners, cable edges' },
  { key: 'tent', label: 'Conic tent', description: 'Square base with a raised mast ring in the middle' },
  { key: 'arch', label: 'Arch-supported canopy', description: 'Two end arches, cable edges along the long sides' },
  { key: 'cable-rectangle', label: 'Rectangle with cable edges', description: 'Sloping rectangle, every edge a cable' },
  { key: 'blank', label: 'Blank', description: 'A flat 6 m square to start from' },
]

function loop(
  role: FrameLoop['role'],
  prefix: string,
  xyz: [number, number, number][],
  edges: (i: number) => FrameEdge,
): FrameLoop {
  const points: FramePoint[] = xyz.map(([x, y, z], i) => ({ id: `${prefix}${i + 1}`, x, y, z }))
  return { role, points, edges: points.map((_, i) => edges(i)) }
}

function frame(loops: FrameLoop[], prestress: number, edgeLength: number): Frame {
  return {
    format: 'veilroom-frame',
    version: 1,
    units: 'm',
    prestress: { warp: prestress, fill: prestress, warpAngle: 0 },
    mesh: { edgeLength },
    loops,
  }
}

const round = (v: number): number => Math.round(v * 1000) / 1000

/** Returns a fresh copy of a starting frame. */
export function starterFrame(key: StarterKey): Frame {
  switch (key) {
    case 'sail':
      return frame(
        [
          loop(
            'outer',
            's',
            [
              [0, 0, 0.5],
              [8, 0, 3.2],
              [8, 8, 0.5],
              [0, 8, 3.2],
            ],
            () => ({ kind: 'cable', tension: 24 }),
          ),
        ],
        2,
        0.3,
      )
    case 'tent': {
      const ring: [number, number, number][] = []
      for (let i = 0; i < 12; i++) {
        const a = (-2 * Math.PI * i) / 12
        ring.push([round(6 + 1.5 * Math.cos(a)), round(6 + 1.5 * Math.sin(a)), 2.0])
      }
      return frame(
        [
          loop(
            'outer',
            't',
            [
              [0, 0, 0],
              [12, 0, 0],
              [12, 12, 0],
              [0, 12, 0],
            ],
            () => ({ kind: 'rigid' }),
          ),
          loop('hole', 'm', ring, () => ({ kind: 'rigid' })),
        ],
        3,
        0.35,
      )
    }
    case 'arch': {
      const pts: [number, number, number][] = []
      const rise = (y: number): number => round(0.4 + 2.6 * Math.sin((Math.PI * y) / 6))
      pts.push([0, 0, 0.4], [10, 0, 0.4])
      for (let k = 1; k < 6; k++) pts.push([10, k, rise(k)])
      pts.push([10, 6, 0.4], [0, 6, 0.4])
      for (let k = 5; k > 0; k--) pts.push([0, k, rise(k)])
      // the long sides (edges 0 and 7) are cables; the arch segments are rigid
      return frame(
        [loop('outer', 'a', pts, (i) => (i === 0 || i === 7 ? { kind: 'cable', tension: 30 } : { kind: 'rigid' }))],
        2.5,
        0.3,
      )
    }
    case 'cable-rectangle':
      return frame(
        [
          loop(
            'outer',
            'r',
            [
              [0, 0, 3],
              [12, 0, 3],
              [12, 8, 4.2],
              [0, 8, 4.2],
            ],
            () => ({ kind: 'cable', tension: 30 }),
          ),
        ],
        2,
        0.35,
      )
    case 'blank':
      return frame(
        [
          loop(
            'outer',
            'b',
            [
              [0, 0, 0],
              [6, 0, 0],
              [6, 6, 0],
              [0, 6, 0],
            ],
            () => ({ kind: 'rigid' }),
          ),
        ],
        2,
        0.3,
      )
  }
}
