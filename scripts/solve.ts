/**
 * `npm run solve -- FRAME.json|FRAME.csv --out SURFACE.json [--format json|obj|stl]
 *  [--figures FIGURES.csv] [--edge-length H]`
 * Reads a frame, solves the membrane, writes the surface and prints the solver summary.
 * Exit codes: 0 settled, 1 usage or file error, 2 invalid frame (message names the field),
 * 3 unsettled (the surface is still written, with the reason printed).
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { extname } from 'node:path'
import { solveFrame } from '../shared/engine'
import { figuresToCsv, surfaceResultToJson, toObj, toStl } from '../shared/export'
import { FrameError, parseFrameCsv, parseFrameJson } from '../shared/frame'
import { MeshError } from '../shared/mesh'
import { CAUTION, reasonWords } from '../shared/protocol'
import type { Frame } from '../shared/types'

interface Args {
  input: string
  out?: string
  format: 'json' | 'obj' | 'stl'
  figures?: string
  edgeLength?: number
}

function fail(code: number, message: string): never {
  process.stderr.write(message + '\n')
  process.exit(code)
}

function parseArgs(argv: readonly string[]): Args {
  const usage = 'usage: npm run solve -- FRAME.json|FRAME.csv --out SURFACE.json [--format json|obj|stl] [--figures FIGURES.csv] [--edge-length H]'
  let input: string | undefined
  const args: Partial<Args> = { format: 'json' }
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!
    const value = (): string => argv[++i] ?? fail(1, `${a} needs a value\n${usage}`)
    if (a === '--out') args.out = value()
    else if (a === '--figures') args.figures = value()
    else if (a === '--format') {
      const f = value()
      if (f !== 'json' && f !== 'obj' && f !== 'stl') fail(1, `--format: "${f}" is not one of json, obj, stl`)
      args.format = f
    } else if (a === '--edge-length') {
      const h = Number(value())
      if (!(h > 0) || !Number.isFinite(h)) fail(1, '--edge-length: must be a number > 0 (metres)')
      args.edgeLength = h
    } else if (a === '--help' || a === '-h') fail(0, usage)
    else if (a.startsWith('--')) fail(1, `unknown option ${a}\n${usage}`)
    else if (input === undefined) input = a
    else fail(1, `unexpected argument ${a}\n${usage}`)
  }
  if (input === undefined) fail(1, usage)
  return { ...args, input } as Args
}

function readFrame(args: Args): Frame {
  let text: string
  try {
    text = readFileSync(args.input, 'utf8')
  } catch (err) {
    fail(1, `cannot read ${args.input}: ${(err as Error).message}`)
  }
  try {
    if (extname(args.input).toLowerCase() === '.csv') {
      return parseFrameCsv(text, args.edgeLength === undefined ? {} : { edgeLength: args.edgeLength })
    }
    const frame = parseFrameJson(text)
    return args.edgeLength === undefined ? frame : parseFrameJson({ ...frame, mesh: { edgeLength: args.edgeLength } })
  } catch (err) {
    if (err instanceof FrameError) fail(2, `Invalid frame ${args.input}: ${err.field}: ${err.reason} [${err.code}]`)
    throw err
  }
}

function main(): void {
  const args = parseArgs(process.argv.slice(2))
  const frame = readFrame(args)
  let result
  try {
    result = solveFrame(frame)
  } catch (err) {
    if (err instanceof FrameError || err instanceof MeshError) fail(2, `Invalid frame ${args.input}: ${err.message}`)
    throw err
  }
  const { solver: s, figures: f } = result
  const state = s.converged ? 'settled' : `unsettled: ${reasonWords(s.reason)}`
  const lines = [
    `Surface ${state}: ${s.method}, ${s.iterations} iterations, residual ${s.residual.toExponential(2)}, ${s.ms.toFixed(0)} ms`,
    `Mesh: ${result.vertices.length} vertices, ${result.triangles.length} triangles, smallest angle ${f.minAngle.toFixed(1)}°`,
    `Area ${f.area.toFixed(3)} m², plan area ${f.planArea.toFixed(3)} m², perimeter ${f.perimeter.toFixed(3)} m`,
    `Height ${f.heightRange[0].toFixed(3)}…${f.heightRange[1].toFixed(3)} m, slope ${f.slopeRange[0].toFixed(1)}…${f.slopeRange[1].toFixed(1)}°, flat (< ${f.flatThreshold}°) ${(100 * f.flatShare).toFixed(1)} %`,
    `Ponding pockets: ${f.pondingPockets.length}${f.pondingPockets.map((p) => ` (${p.x.toFixed(2)}, ${p.y.toFixed(2)}) ${p.area.toFixed(2)} m²`).join(',')}`,
    ...f.cables.map((c) => `Cable loop ${c.loop} edge ${c.edge}: length ${c.length.toFixed(3)} m, force ${c.force} kN, sag ${c.sag.toFixed(3)} m`),
    `Caution: ${CAUTION}`,
  ]
  process.stdout.write(lines.join('\n') + '\n')
  if (args.out) {
    const text = args.format === 'obj' ? toObj(result) : args.format === 'stl' ? toStl(result) : surfaceResultToJson(result)
    writeFileSync(args.out, text)
    process.stdout.write(`Wrote ${args.out} (${args.format})\n`)
  }
  if (args.figures) {
    writeFileSync(args.figures, figuresToCsv({ frame, figures: f, solver: s, pins: [] }, CAUTION))
    process.stdout.write(`Wrote ${args.figures} (figures CSV)\n`)
  }
  if (!s.converged) process.exit(3)
}

main()
