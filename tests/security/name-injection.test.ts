/**
 * Issue 12, item 7: line and formula injection through names. A room or snapshot name with a line
 * break used to add lines to OBJ headers (an `mtllib` line, vertices) and rows to figures.csv (a
 * `=HYPERLINK(…)` cell), and lines to the plain-text invite mail. Names now refuse control
 * characters and unpaired surrogates at validation; output built from older stored names is kept
 * on one line; CSV text cells that start like a formula are neutralised as the OWASP "CSV
 * Injection" page advises (a leading apostrophe for = + - @, tab and carriage return).
 */
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { csvText, tableToCsv } from '../../shared/export/figures-csv.js'
import { solveFrame } from '../../shared/engine.js'
import { parseFrameJson } from '../../shared/frame/index.js'
import { uniqueEmail } from '../helpers/test-server.js'
import {
  download,
  engineLive,
  mailIds,
  mailTo,
  roomWithCast,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from '../server/teamwork-helpers.js'

const engine = engineLive((f) => solveFrame(f))
let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer(engine.live)
  cast = await roomWithCast(tw, 'Market hall sail — names')
  const frame = parseFrameJson(readFileSync(resolve(import.meta.dirname, '../../examples/hypar-sail.json'), 'utf8'))
  engine.setFrame({ ...frame, mesh: { edgeLength: 0.75 } })
})
afterAll(async () => {
  await tw?.stop()
})
const room = () => `/api/rooms/${cast.roomId}`

// Each would break a one-line name: LF, CR LF, NUL, tab, ESC, U+2028, and two unpaired surrogates.
const hostileNames = [
  'Sail\nmtllib evil.mtl',
  'Sail\r\n=HYPERLINK("http://attacker.invalid","open")',
  'Sail\u0000',
  'Sail\tv 0 0 0',
  'Sail\u001b[2J',
  'Sail\u2028v 1 1 1',
  'Sail \ud800',
  'Sail \udfff end',
]

describe('names refuse control characters at validation', () => {
  it.each(hostileNames.map((name) => [JSON.stringify(name), name]))(
    'room name %s → 400 naming the field',
    async (_label, name) => {
      const created = await cast.clients.owner.post('/api/rooms', { name })
      expect(created.status).toBe(400)
      expect(created.body.error).toMatchObject({ code: 'invalid_input', field: 'name' })
      expect(created.body.error.message).toMatch(/^name: (no line breaks|contains a broken character)/)
      const renamed = await cast.clients.owner.patch(room(), { name })
      expect(renamed.status).toBe(400)
      expect(renamed.body.error.field).toBe('name')
    },
  )

  it('refuses them in snapshot names, person names, and NUL in descriptions, notes and comments', async () => {
    for (const name of hostileNames) {
      const snap = await cast.clients.editor.post(`${room()}/snapshots`, { name })
      expect([snap.status, snap.body.error?.field]).toEqual([400, 'name'])
      const person = await tw
        .client()
        .post('/api/auth/signup', { email: uniqueEmail('named'), name, password: 'long-enough-pass' })
      expect([person.status, person.body.error?.field]).toEqual([400, 'name'])
    }
    const description = await cast.clients.owner.patch(room(), { description: 'two\u0000parts' })
    expect([description.status, description.body.error?.field]).toEqual([400, 'description'])
    const note = await cast.clients.editor.post(`${room()}/snapshots`, { name: 'Fine', note: 'a\u0000b' })
    expect([note.status, note.body.error?.field]).toEqual([400, 'note'])
    const pin = await cast.clients.reviewer.post(`${room()}/pins`, {
      x: 0,
      y: 0,
      z: 0,
      docVersion: 0,
      body: 'look \ud800',
    })
    expect([pin.status, pin.body.error?.field]).toEqual([400, 'body'])
  })

  it('keeps line breaks where text has lines (descriptions) and accepts ordinary names', async () => {
    const ok = await cast.clients.owner.patch(room(), {
      description: 'Line one\nline two\r\n\tindented',
      name: 'Market hall sail — Süd (v2) = draft',
    })
    expect(ok.status).toBe(200)
    expect(ok.body.room.name).toBe('Market hall sail — Süd (v2) = draft')
  })
})

describe('output built from an older stored name stays on its lines', () => {
  const legacy = 'Old sail\nmtllib evil.mtl\nv 9 9 9\n=HYPERLINK("http://attacker.invalid","open")\r\n@SUM(A1)'

  it('OBJ and CSV headers gain no lines and no formula rows; pin comments cannot start a formula', async () => {
    await tw.server.dataSource.query('UPDATE rooms SET name = ? WHERE id = ?', [legacy, cast.roomId])
    // Comments are free text and reach the CSV's pins table as cells.
    for (const body of ['=HYPERLINK("http://attacker.invalid","open")', '@SUM(A1:A9)', '+41 22', '-2+3']) {
      const pin = await cast.clients.reviewer.post(`${room()}/pins`, { x: 1, y: 1, z: 1, docVersion: 0, body })
      expect(pin.status).toBe(201)
    }
    const surface = (await engine.live.getLatestSurface())!
    const obj = (await download(cast.clients.viewer, `${room()}/surface.obj`)).bytes.toString()
    expect(obj).not.toMatch(/^mtllib/m)
    expect(obj.match(/^v /gm)).toHaveLength(surface.vertices.length / 3)
    expect(obj.split('\n')[0]).toContain('Old sail mtllib evil.mtl v 9 9 9')
    const csv = (await download(cast.clients.viewer, `${room()}/figures.csv`)).bytes.toString()
    expect(csv.split('\n')[0]).toContain('Old sail mtllib evil.mtl v 9 9 9 =HYPERLINK')
    // No line and no cell starts with = + @ (a "-" may lead a negative number), and the comments
    // are there, neutralised.
    expect(csv).not.toMatch(/(^|,)"?[=+@]/m)
    expect(csv).toContain(`"'=HYPERLINK(""http://attacker.invalid"",""open"")"`)
    expect(csv).toContain("'@SUM(A1:A9)")
    expect(csv).toContain("'-2+3")
  })

  it('the plain-text invite mail and its subject gain no lines', async () => {
    await tw.server.dataSource.query('UPDATE rooms SET name = ? WHERE id = ?', [legacy, cast.roomId])
    const to = uniqueEmail('mail-lines')
    const seen = await mailIds(tw, to)
    expect((await cast.clients.owner.post(`${room()}/invites`, { email: to, role: 'viewer' })).status).toBe(201)
    const mail = await mailTo(tw, to, seen)
    expect(mail.subject).not.toMatch(/[\r\n]/)
    const lines = mail.text.split(/\r?\n/)
    expect(lines.filter((l) => /^(mtllib|v 9|=HYPERLINK|@SUM)/.test(l))).toEqual([])
    // The template's five lines of text (invite-mail.ts), however the name reads.
    expect(lines.filter((l) => l !== '')).toHaveLength(5)
  })
})

describe('CSV cells (OWASP CSV Injection: = + - @ tab CR lead a formula)', () => {
  it('neutralises text cells that would run as formulas and leaves numbers alone', () => {
    expect(csvText('=1+1')).toBe("'=1+1")
    expect(csvText('+41 22')).toBe("'+41 22")
    expect(csvText('-2+3')).toBe("'-2+3")
    expect(csvText('@SUM(A1:A9)')).toBe("'@SUM(A1:A9)")
    expect(csvText('\t=1')).toBe("'\t=1")
    expect(csvText('\r=1')).toBe('"\'\r=1"')
    expect(csvText('=HYPERLINK("http://x","y")')).toBe('"\'=HYPERLINK(""http://x"",""y"")"')
    expect(csvText('area')).toBe('area')
    const table = {
      key: 't',
      title: 'T',
      columns: [{ label: 'what' }, { label: 'z', unit: 'm' }],
      rows: [
        ['-1 below', -0.25],
        ['=A1', 1],
      ],
    }
    expect(tableToCsv(table)).toEqual(['# T', 'what,z (m)', "'-1 below,-0.25", "'=A1,1.00"])
  })
})
