/**
 * `npm run -s pattern -- SURFACE.json --cuts CUTS.json --out PATTERN.json [--dxf F] [--svg F]`
 * Reads a surface (the solve CLI's JSON; vertices and triangles only) and a cuts file, lays every
 * strip flat and writes the pattern (PRODUCT.md "Cuts file and pattern result").
 * Exit codes: 0 done, 1 usage or file error, 2 invalid surface or cuts (message names the field).
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { patternToDxf, patternToSvg } from '../shared/export'
import {
  computePattern,
  parseCutsFile,
  parseSurfaceFile,
  PatternError,
  PATTERN_CAUTION,
  type CutSettings,
  type TriangleMesh,
} from '../shared/pattern'

const usage =
  'usage: npm run -s pattern -- SURFACE.json --cuts CUTS.json --out PATTERN.json [--dxf FILE.dxf] [--svg FILE.svg]'

interface Args {
  surface: string
  cuts: string
  out: string
  dxf?: string
  svg?: string
}

function fail(code: number, message: string): never {
  process.stderr.write(message + '\n')
  process.exit(code)
}

function parseArgs(argv: readonly string[]): Args {
  const args: Partial<Args> = {}
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!
    const value = (): string => argv[++i] ?? fail(1, `${a} needs a value\n${usage}`)
    if (a === '--cuts') args.cuts = value()
    else if (a === '--out') args.out = value()
    else if (a === '--dxf') args.dxf = value()
    else if (a === '--svg') args.svg = value()
    else if (a === '--help' || a === '-h') fail(0, usage)
    else if (a.startsWith('--')) fail(1, `unknown option ${a}\n${usage}`)
    else if (args.surface === undefined) args.surface = a
    else fail(1, `unexpected argument ${a}\n${usage}`)
  }
  if (!args.surface || !args.cuts || !args.out) fail(1, usage)
  return args as Args
}

function readText(path: string): string {
  try {
    return readFileSync(path, 'utf8')
  } catch (err) {
    fail(1, `cannot read ${path}: ${(err as Error).message}`)
  }
}

function parse<T>(path: string, what: string, parser: (text: string) => T): T {
  try {
    return parser(readText(path))
  } catch (err) {
    if (err instanceof PatternError) fail(2, `Invalid ${what} ${path}: ${err.field}: ${err.reason} [${err.code}]`)
    throw err
  }
}

function main(): void {
  const args = parseArgs(process.argv.slice(2))
  const surface: TriangleMesh = parse(args.surface, 'surface', parseSurfaceFile)
  const cuts: CutSettings = parse(args.cuts, 'cuts', parseCutsFile)
  const started = performance.now()
  let result
  try {
    result = computePattern(surface, cuts).result
  } catch (err) {
    if (err instanceof PatternError) fail(2, `Invalid cuts ${args.cuts}: ${err.field}: ${err.reason} [${err.code}]`)
    throw err
  }
  const ms = performance.now() - started
  const lines = [`Pattern: ${result.strips.length} strips in ${ms.toFixed(0)} ms`]
  for (const s of result.strips) {
    const worst = s.seams.reduce((w, x) => Math.max(w, Math.abs(x.mismatch)), 0)
    lines.push(
      `${s.id}: area ${s.area3d.toFixed(3)} m² (flat ${s.areaFlat.toFixed(3)}), ${s.length.toFixed(3)} × ${s.width.toFixed(3)} m${s.overWidth ? ' OVER ROLL WIDTH' : ''}, strain warp ${(100 * s.strain.maxWarp).toFixed(2)} % fill ${(100 * s.strain.maxFill).toFixed(2)} % rms ${(100 * s.strain.rms).toFixed(2)} %, seam mismatch ≤ ${(1000 * worst).toFixed(1)} mm`,
    )
  }
  lines.push(PATTERN_CAUTION)
  process.stdout.write(lines.join('\n') + '\n')
  writeFileSync(args.out, JSON.stringify(result, null, 1) + '\n')
  process.stdout.write(`Wrote ${args.out}\n`)
  if (args.dxf) {
    writeFileSync(args.dxf, patternToDxf(result))
    process.stdout.write(`Wrote ${args.dxf} (DXF)\n`)
  }
  if (args.svg) {
    writeFileSync(args.svg, patternToSvg(result))
    process.stdout.write(`Wrote ${args.svg} (SVG)\n`)
  }
}

main()
