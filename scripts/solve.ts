/**
 * `npm run solve -- FRAME.json|FRAME.csv --out SURFACE.json [--format json|obj|stl]
 *  [--figures FIGURES.csv] [--edge-length H]`
 * Reads a frame, solves the membrane, writes the surface and prints the solver summary.
 * Exit codes: 0 settled, 1 usage or file error, 2 invalid frame (message names the field),
 * 3 unsettled (the surface is still written, with the reason printed).
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { extname } from 'node:path'
import { parseArgs } from 'node:util'
import { solveFrame } from '../shared/engine'
import { figuresToCsv, surfaceResultToJson, toObj, toStl } from '../shared/export'
import { FrameError, parseFrameCsv, parseFrameJson } from '../shared/frame'
import { MeshError } from '../shared/mesh'
import { CAUTION, reasonWords } from '../shared/protocol'
import { cableName } from '../shared/report'
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

const usage =
  'usage: npm run solve -- FRAME.json|FRAME.csv --out SURFACE.json [--format json|obj|stl] [--figures FIGURES.csv] [--edge-length H]'

/** The command line, read with node:util parseArgs; a bad option exits 1 naming it. */
function readArgs(argv: string[]): Args {
  let parsed
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: {
        out: { type: 'string' },
        figures: { type: 'string' },
        format: { type: 'string', default: 'json' },
        'edge-length': { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
    })
  } catch (err) {
    fail(1, `${(err as Error).message}\n${usage}`)
  }
  const { values, positionals } = parsed
  if (values.help) fail(0, usage)
  if (positionals.length !== 1) fail(1, positionals.length ? `unexpected argument ${positionals[1]}\n${usage}` : usage)
  const format = values.format
  if (format !== 'json' && format !== 'obj' && format !== 'stl')
    fail(1, `--format: "${format}" is not one of json, obj, stl`)
  let edgeLength: number | undefined
  if (values['edge-length'] !== undefined) {
    edgeLength = Number(values['edge-length'])
    if (!(edgeLength > 0) || !Number.isFinite(edgeLength)) fail(1, '--edge-length: must be a number > 0 (metres)')
  }
  return { input: positionals[0]!, out: values.out, format, figures: values.figures, edgeLength }
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
  const args = readArgs(process.argv.slice(2))
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
    ...f.cables.map(
      (c) =>
        `Cable ${cableName(c)}: length ${c.length.toFixed(3)} m, prestress-state force ${c.force.toFixed(1)} kN, sag ${c.sag.toFixed(3)} m`,
    ),
    `Caution: ${CAUTION}`,
  ]
  process.stdout.write(lines.join('\n') + '\n')
  if (args.out) {
    const text =
      args.format === 'obj' ? toObj(result) : args.format === 'stl' ? toStl(result) : surfaceResultToJson(result)
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
