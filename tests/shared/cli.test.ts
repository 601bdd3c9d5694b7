import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { CAUTION, CAUTION_TITLE } from '../../shared/protocol'
import { frameFile, squareLoop } from './frame-fixtures'

const dir = mkdtempSync(join(tmpdir(), 'veilroom-cli-'))
function solve(...args: string[]) {
  return spawnSync(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', ...args], {
    encoding: 'utf8',
    timeout: 60_000,
  })
}

describe('npm run solve', () => {
  it('refuses an invalid frame with exit code 2 and a message naming the field', () => {
    const bad = join(dir, 'bad.json')
    const pts = squareLoop(4)
    pts[1] = { x: 4, y: 0, z: Number.NaN }
    writeFileSync(bad, JSON.stringify(frameFile(pts)).replace('null', '"high"'))
    const r = solve(bad, '--out', join(dir, 'out.json'))
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/loops\[0\]\.points\[1\]\.z/)
  })

  it('names the CSV line and column', () => {
    const bad = join(dir, 'bad.csv')
    writeFileSync(bad, 'loop,x,y,z\n0,0,0,0\n0,4,0,0\n0,4,4,0,cable\n0,0,4,0\n')
    const r = solve(bad)
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/line 4, column tension/)
  })

  it('exits 1 on usage errors', () => {
    expect(solve().status).toBe(1)
    expect(solve('x.json', '--format', 'dwg').stderr).toMatch(/--format/)
  })

  it('solves a small frame, prints the summary and the caution, writes OBJ', () => {
    const good = join(dir, 'sail.json')
    writeFileSync(
      good,
      JSON.stringify(
        frameFile(
          squareLoop(4, 0, 0, (i) => (i % 2 ? 1 : 0)),
          [],
          0.5,
        ),
      ),
    )
    const out = join(dir, 'sail.obj')
    const r = solve(good, '--out', out, '--format', 'obj')
    expect(r.stderr).toBe('')
    expect(r.status).toBe(0)
    expect(r.stdout).toMatch(/Surface settled/)
    expect(r.stdout).toMatch(/qualified engineer/)
    expect(readFileSync(out, 'utf8')).toMatch(/^# Veilroom surface/)
  })

  it('writes the caution into the JSON (a caution field) and the STL (the solid name); names cables as the workbench does', () => {
    const sail = join(dir, 'cable-sail.json')
    const file = frameFile(
      squareLoop(4, 0, 0, (i) => (i % 2 ? 1 : 0)),
      [],
      0.5,
    ) as { loops: { edges?: unknown[] }[] }
    file.loops[0]!.edges = [{ kind: 'rigid' }, { kind: 'cable', tension: 10 }, { kind: 'rigid' }, { kind: 'rigid' }]
    writeFileSync(sail, JSON.stringify(file))
    const json = join(dir, 'sail.json.out')
    const r = solve(sail, '--out', json)
    expect(r.stderr).toBe('')
    expect(JSON.parse(readFileSync(json, 'utf8')).caution).toBe(CAUTION)
    // edge index 1 of the outer loop is the second edge: "Outer E2" (shared/report/numbering.ts)
    expect(r.stdout).toMatch(/^Cable Outer E2: length [\d.]+ m, prestress-state force [\d.]+ kN/m)
    const stl = join(dir, 'sail.stl')
    expect(solve(sail, '--out', stl, '--format', 'stl').status).toBe(0)
    expect(readFileSync(stl, 'utf8').split('\n')[0]).toBe(`solid veilroom_surface ${CAUTION_TITLE}: ${CAUTION}`)
  })

  it('refuses an unknown option naming it (node:util parseArgs)', () => {
    const r = solve('x.json', '--colour', 'red')
    expect(r.status).toBe(1)
    expect(r.stderr).toMatch(/--colour/)
  })
})
