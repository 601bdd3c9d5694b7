import { AppError } from '../../lib/app-error.js'

export interface ImageInfo {
  mime: 'image/png' | 'image/jpeg'
  width: number
  height: number
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])

/** PNG (signature + IHDR, PNG spec section 5.2/11.2.2) or JPEG (SOI + a SOFn segment, ITU T.81 B.2). */
export function inspectImage(bytes: Buffer): ImageInfo | null {
  if (bytes.length >= 24 && bytes.subarray(0, 8).equals(PNG_SIGNATURE) && bytes.toString('latin1', 12, 16) === 'IHDR') {
    return { mime: 'image/png', width: bytes.readUInt32BE(16), height: bytes.readUInt32BE(20) }
  }
  if (bytes.length >= 4 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) {
    let at = 2
    while (at + 9 < bytes.length) {
      if (bytes[at] !== 0xff) return null
      const marker = bytes[at + 1]!
      if (marker === 0xff) {
        at += 1 // fill byte
        continue
      }
      const length = bytes.readUInt16BE(at + 2)
      // SOF0–SOF15 carry the frame size, except DHT (C4), JPG (C8) and DAC (CC).
      if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
        return { mime: 'image/jpeg', height: bytes.readUInt16BE(at + 5), width: bytes.readUInt16BE(at + 7) }
      }
      at += 2 + length
    }
  }
  return null
}

/** The image's type and size from its bytes (never from the file name or the client's claim). */
export function requireImage(bytes: Buffer, field: string): ImageInfo {
  const info = inspectImage(bytes)
  if (!info)
    throw new AppError(
      'invalid_image',
      400,
      'The underlay must be a PNG or JPEG image (checked by its content).',
      field,
    )
  if (info.width < 1 || info.height < 1 || info.width > 20_000 || info.height > 20_000) {
    throw new AppError(
      'invalid_image',
      400,
      `The image size ${info.width}×${info.height} px is outside 1–20000 px.`,
      field,
    )
  }
  return info
}
