import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { crc32, deflateSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { solveFrame } from '../../shared/engine.js'
import { parseFrameCsv, parseFrameJson } from '../../shared/frame/index.js'
import {
  download,
  engineLive,
  roomWithCast,
  sendForm,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from './teamwork-helpers.js'

const example = (name: string) => readFileSync(resolve(import.meta.dirname, '../../examples', name), 'utf8')
const fileForm = (name: string, content: string | Buffer, field = 'file', type = 'application/octet-stream') => {
  const form = new FormData()
  form.append(field, new Blob([typeof content === 'string' ? content : new Uint8Array(content)], { type }), name)
  return form
}

/** A real 3×2 RGB PNG (PNG spec: signature, IHDR, IDAT with zlib data, IEND; CRC-32 over type+data). */
function tinyPng(width = 3, height = 2): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const head = Buffer.alloc(8)
    head.writeUInt32BE(data.length, 0)
    head.write(type, 4, 'latin1')
    const crc = Buffer.alloc(4)
    crc.writeUInt32BE(crc32(Buffer.concat([Buffer.from(type, 'latin1'), data])), 0)
    return Buffer.concat([head, data, crc])
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr.set([8, 2, 0, 0, 0], 8)
  const rows = Buffer.alloc(height * (1 + 3 * width), 0x7f)
  for (let r = 0; r < height; r++) rows[r * (1 + 3 * width)] = 0
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(rows)),
    chunk('IEND', Buffer.alloc(0)),
  ])
}

/** JPEG markers per ITU T.81 B.2: SOI, APP0 (JFIF), SOF0 with height 480 and width 640, EOI. */
function jpegHeader(): Buffer {
  const app0 = [
    0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00,
  ]
  const sof0 = [
    0xff, 0xc0, 0x00, 0x11, 0x08, 0x01, 0xe0, 0x02, 0x80, 0x03, 0x01, 0x22, 0x00, 0x02, 0x11, 0x01, 0x03, 0x11, 0x01,
  ]
  return Buffer.from([0xff, 0xd8, ...app0, ...sof0, 0xff, 0xd9])
}

const scale = { ax: '10', ay: '20', bx: '310', by: '420', distance: '25', originX: '5', originY: '6' }
const underlayForm = (image: Buffer, name = 'site.png', fields: Record<string, string> = scale) => {
  const form = fileForm(name, image, 'image', 'image/png')
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  return form
}

const engine = engineLive((f) => solveFrame(f))
let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer(engine.live)
  cast = await roomWithCast(tw, 'Terrace Café / "shade sail" — Süd')
})
afterAll(async () => {
  await tw?.stop()
})
const room = () => `/api/rooms/${cast.roomId}`

describe('frame import', () => {
  it('reads the JSON and CSV examples with the shared parser', async () => {
    const json = await sendForm(
      cast.clients.editor,
      'POST',
      `${room()}/frame/import`,
      fileForm('hypar-sail.json', example('hypar-sail.json')),
    )
    expect(json.status).toBe(200)
    expect(json.body.frame).toEqual(parseFrameJson(example('hypar-sail.json')))
    const form = fileForm('hypar-sail.csv', example('hypar-sail.csv'))
    form.append('warp', '4')
    form.append('edgeLength', '0.5')
    const csv = await sendForm(cast.clients.editor, 'POST', `${room()}/frame/import`, form)
    expect(csv.status).toBe(200)
    expect(csv.body.frame).toEqual(
      parseFrameCsv(example('hypar-sail.csv'), { prestress: { warp: 4, fill: 4 }, edgeLength: 0.5 }),
    )
  })

  it('names the field and the reason for bad files', async () => {
    const post = (form: FormData) => sendForm(cast.clients.editor, 'POST', `${room()}/frame/import`, form)
    const badJson = await post(fileForm('frame.json', '{ "loops": [ '))
    expect(badJson.status).toBe(400)
    expect(badJson.body.error).toMatchObject({
      code: 'invalid_frame',
      field: '(file)',
      message: expect.stringMatching(/not valid JSON/),
    })

    const text = JSON.parse(example('hypar-sail.json'))
    text.loops[0].points[2].z = 'high'
    const badField = await post(fileForm('frame.json', JSON.stringify(text)))
    expect(badField.body.error).toMatchObject({ code: 'invalid_frame', field: 'loops[0].points[2].z' })

    const csv = 'loop,x,y,z\nouter,0,0,0\nouter,8,zero,1\nouter,8,8,0\n'
    const badCsv = await post(fileForm('frame.csv', csv))
    expect(badCsv.status).toBe(400)
    expect(badCsv.body.error.code).toBe('invalid_frame')
    expect(badCsv.body.error.field).toMatch(/^line 3\b/)

    const crossing = {
      loops: [
        {
          role: 'outer',
          points: [
            { x: 0, y: 0, z: 0 },
            { x: 4, y: 4, z: 0 },
            { x: 4, y: 0, z: 0 },
            { x: 0, y: 4, z: 0 },
          ],
        },
      ],
    }
    const selfCrossing = await post(fileForm('bow.json', JSON.stringify(crossing)))
    expect(selfCrossing.body.error.message).toMatch(/cross/i)

    const wrongKind = await post(fileForm('frame.txt', example('hypar-sail.json')))
    expect(wrongKind.body.error).toMatchObject({ code: 'invalid_frame', field: 'file' })
    const noFile = await post(new FormData())
    expect(noFile.body.error).toMatchObject({ code: 'invalid_upload', field: 'file' })
  })

  it('refuses a file over 1 MB with 413', async () => {
    const big = await sendForm(
      cast.clients.editor,
      'POST',
      `${room()}/frame/import`,
      fileForm('big.json', ' '.repeat(1024 * 1024 + 1)),
    )
    expect(big.status).toBe(413)
    expect(big.body.error).toMatchObject({ code: 'too_large', field: 'file' })
  })
})

describe('underlay image', () => {
  it('stores a PNG with its scale, serves the same bytes, and deletes it', async () => {
    const png = tinyPng()
    const put = await sendForm(cast.clients.editor, 'PUT', `${room()}/underlay`, underlayForm(png))
    expect(put.status).toBe(200)
    expect(put.body.underlay).toMatchObject({
      mime: 'image/png',
      width: 3,
      height: 2,
      ax: 10,
      ay: 20,
      bx: 310,
      by: 420,
      distance: 25,
      originX: 5,
      originY: 6,
    })
    // A and B are 500 px apart (a 3-4-5 triangle) and 25 m apart: 0.05 m per pixel.
    expect(put.body.underlay.metresPerPixel).toBeCloseTo(0.05, 12)
    const image = await download(cast.clients.viewer, `${room()}/underlay`)
    expect(image.headers.get('content-type')).toBe('image/png')
    expect(image.bytes.equals(png)).toBe(true)
    expect((await cast.clients.viewer.get(`${room()}/underlay/meta`)).body.underlay.width).toBe(3)

    const jpeg = await sendForm(
      cast.clients.editor,
      'PUT',
      `${room()}/underlay`,
      underlayForm(jpegHeader(), 'plan.jpg'),
    )
    expect(jpeg.body.underlay).toMatchObject({ mime: 'image/jpeg', width: 640, height: 480 })

    expect((await cast.clients.editor.delete(`${room()}/underlay`)).status).toBe(204)
    // No underlay is an empty value, not an error: the room page asks on every open (issue 14).
    const none = await cast.clients.viewer.get(`${room()}/underlay/meta`)
    expect(none.status).toBe(200)
    expect(none.body).toEqual({ underlay: null })
  })

  it('checks the type by content, the size and the scale', async () => {
    const gif = Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1')
    const wrong = await sendForm(cast.clients.editor, 'PUT', `${room()}/underlay`, underlayForm(gif, 'looks-like.png'))
    expect(wrong.status).toBe(400)
    expect(wrong.body.error).toMatchObject({ code: 'invalid_image', field: 'image' })

    // Just under the limit is stored whole (MariaDB's max_allowed_packet must allow it).
    const nearLimit = Buffer.concat([tinyPng(), Buffer.alloc(4 * 1024 * 1024 - 200, 0x20)])
    expect((await sendForm(cast.clients.editor, 'PUT', `${room()}/underlay`, underlayForm(nearLimit))).status).toBe(200)
    expect((await download(cast.clients.viewer, `${room()}/underlay`)).bytes.equals(nearLimit)).toBe(true)

    const huge = Buffer.concat([tinyPng(), Buffer.alloc(4 * 1024 * 1024)])
    const big = await sendForm(cast.clients.editor, 'PUT', `${room()}/underlay`, underlayForm(huge))
    expect(big.status).toBe(413)

    const same = await sendForm(
      cast.clients.editor,
      'PUT',
      `${room()}/underlay`,
      underlayForm(tinyPng(), 'a.png', { ...scale, bx: '10', by: '20' }),
    )
    expect(same.body.error).toMatchObject({ code: 'invalid_input', field: 'bx' })
    const noDistance = await sendForm(
      cast.clients.editor,
      'PUT',
      `${room()}/underlay`,
      underlayForm(tinyPng(), 'a.png', { ...scale, distance: '-3' }),
    )
    expect(noDistance.body.error.field).toBe('distance')
  })
})

describe('downloads', () => {
  it('exports frame, surface and figures with the caution; frame.json re-imports unchanged', async () => {
    const frame = parseFrameJson(example('hypar-sail.json'))
    engine.setFrame({ ...frame, mesh: { edgeLength: 0.5 } })
    const json = await download(cast.clients.viewer, `${room()}/frame.json`)
    expect(json.status).toBe(200)
    const disposition = json.headers.get('content-disposition') ?? ''
    expect(disposition).toMatch(/^attachment; filename="?Terrace-Cafe-shade-sail-Sud-frame\.json"?$/)
    expect(JSON.parse(json.bytes.toString()).caution).toMatch(/qualified engineer/)
    const back = await sendForm(
      cast.clients.editor,
      'POST',
      `${room()}/frame/import`,
      fileForm('again.json', json.bytes),
    )
    expect(back.body.frame).toEqual({ ...frame, mesh: { edgeLength: 0.5 } })

    const surface = (await engine.live.getLatestSurface())!
    const obj = (await download(cast.clients.viewer, `${room()}/surface.obj`)).bytes.toString()
    expect(obj.split('\n').slice(0, 5).join('\n')).toMatch(/# .*preliminary/)
    expect(obj.match(/^v /gm)).toHaveLength(surface.vertices.length / 3)
    expect(obj.match(/^f /gm)).toHaveLength(surface.triangles.length / 3)
    const stl = await download(cast.clients.viewer, `${room()}/surface.stl`)
    expect(stl.bytes.toString().split('\n')[0]).toMatch(
      /^solid veilroom_surface Preliminary form-finding result: Form-finding results are preliminary/,
    )
    expect(stl.bytes.toString().match(/facet normal/g)).toHaveLength(surface.triangles.length / 3)
    const csv = await download(cast.clients.viewer, `${room()}/figures.csv`)
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(csv.bytes.toString()).toMatch(/^# Veilroom — .*\n# Form-finding results are preliminary/)
  })

  it('figures.csv carries the report tables: frame points numbered as in the workbench, forces, open pins', async () => {
    const frame = parseFrameJson(example('hypar-sail.json'))
    engine.setFrame({ ...frame, mesh: { edgeLength: 0.5 } })
    const pin = await cast.clients.reviewer.post(`${room()}/pins`, {
      x: 1,
      y: 2,
      z: 3,
      docVersion: 1,
      body: 'Corner plate, 12 mm?',
    })
    expect(pin.status).toBe(201)
    const csv = (await download(cast.clients.viewer, `${room()}/figures.csv`)).bytes.toString()
    const section = (title: string) =>
      csv
        .split('\n\n')
        .find((s) => s.startsWith(`# ${title}\n`))
        ?.split('\n')
        .filter((l) => !l.startsWith('#')) ?? []
    const points = section('Frame points')
    expect(points).toHaveLength(1 + frame.loops[0]!.points.length)
    const p1 = frame.loops[0]!.points[0]!
    expect(points[1]).toBe(
      `Outer P1,${p1.x.toFixed(3)},${p1.y.toFixed(3)},${p1.z.toFixed(3)},Outer E1 ${frame.loops[0]!.edges[0]!.kind}`,
    )
    expect(section('Forces at frame points (prestress state)')).toHaveLength(1 + frame.loops[0]!.points.length)
    expect(section('Open pins')[1]).toMatch(
      /^1,1\.00,2\.00,3\.00,[^,]+,\d{4}-\d\d-\d\d \d\d:\d\d UTC,"Corner plate, 12 mm\?",$/,
    )
  })

  it('exports a snapshot the same way, named after room and snapshot', async () => {
    const sail = parseFrameJson(example('hypar-sail.json'))
    const frame = {
      ...sail,
      mesh: { edgeLength: 0.5 },
      loops: [{ ...sail.loops[0]!, points: sail.loops[0]!.points.map((p, i) => (i === 1 ? { ...p, z: 4.25 } : p)) }],
    }
    engine.setFrame(frame)
    const saved = await cast.clients.editor.post(`${room()}/snapshots`, { name: 'Tent v2 (mast 6 m)' })
    expect(saved.status).toBe(201)
    engine.setFrame(parseFrameJson(example('hypar-sail.json')), { settle: false })
    const base = `${room()}/snapshots/${saved.body.snapshot.id}`
    const json = await download(cast.clients.viewer, `${base}/frame.json`)
    expect(json.headers.get('content-disposition')).toMatch(
      /filename="?Terrace-Cafe-shade-sail-Sud-Tent-v2-mast-6-m-frame\.json"?$/,
    )
    const back = await sendForm(
      cast.clients.editor,
      'POST',
      `${room()}/frame/import`,
      fileForm('again.json', json.bytes),
    )
    expect(back.body.frame).toEqual(frame)
    const csv = (await download(cast.clients.viewer, `${base}/figures.csv`)).bytes.toString()
    expect(csv).toMatch(/snapshot "Tent v2 \(mast 6 m\)"/)
    expect((await download(cast.clients.viewer, `${base}/surface.stl`)).status).toBe(200)
  })
})
