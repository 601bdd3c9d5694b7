/**
 * Binary fields of socket messages arrive as ArrayBuffer (browser), Buffer (Node) or a typed array
 * (same process); these zod types turn any of them into the typed array the message declares.
 */
import { z } from 'zod'

type TypedCtor<T> = { new (buffer: ArrayBufferLike, byteOffset: number, length: number): T; BYTES_PER_ELEMENT: number }

/** A view of `value` as T; throws an Error saying why it cannot be one. */
function wrap<T>(value: unknown, Ctor: TypedCtor<T>): T {
  let buffer: ArrayBufferLike
  let offset = 0
  let bytes: number
  if (value instanceof ArrayBuffer) {
    buffer = value
    bytes = value.byteLength
  } else if (ArrayBuffer.isView(value)) {
    buffer = value.buffer
    offset = value.byteOffset
    bytes = value.byteLength
  } else {
    throw new Error(`expected binary data, got ${value === null ? 'null' : typeof value}`)
  }
  const size = Ctor.BYTES_PER_ELEMENT
  if (bytes % size !== 0) throw new Error(`${bytes} bytes is not a whole number of ${size}-byte values`)
  // A view into a pooled Node Buffer may start at an unaligned offset; copy it out then.
  if (offset % size !== 0) {
    buffer = new Uint8Array(buffer, offset, bytes).slice().buffer
    offset = 0
  }
  return new Ctor(buffer, offset, bytes / size)
}

const typed = <T>(Ctor: TypedCtor<T>) =>
  z.unknown().transform((value, ctx): T => {
    try {
      return wrap(value, Ctor)
    } catch (err) {
      ctx.addIssue({ code: 'custom', message: (err as Error).message })
      return z.NEVER
    }
  })

export const float32Schema = typed(Float32Array)
export const uint32Schema = typed(Uint32Array)
export const uint8Schema = typed(Uint8Array)
