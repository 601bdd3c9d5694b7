import type { Request, Response } from 'express'
import multer from 'multer'
import { AppError } from '../../lib/app-error.js'

/**
 * multer with memory storage and explicit limits (its fileSize limit is Infinity unless set), run
 * as a promise so its errors become AppErrors: too big → 413 'too_large', other multipart
 * problems → 400 'invalid_upload', each naming the field.
 */
export function singleUpload(field: string, maxBytes: number, maxFields: number) {
  const middleware = multer({
    storage: multer.memoryStorage(),
    limits: {
      files: 1,
      fileSize: maxBytes,
      fields: maxFields,
      fieldSize: 1024,
      parts: maxFields + 1,
      headerPairs: 100,
    },
  }).single(field)
  return (req: Request, res: Response) =>
    new Promise<void>((resolve, reject) => {
      middleware(req, res, (err: unknown) => (err ? reject(uploadError(err, field, maxBytes)) : resolve()))
    })
}

function uploadError(err: unknown, field: string, maxBytes: number): AppError {
  if (err instanceof multer.MulterError) {
    const at = err.field ?? field
    if (err.code === 'LIMIT_FILE_SIZE') {
      return new AppError('too_large', 413, `The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`, at)
    }
    if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
      return new AppError('invalid_upload', 400, `Send exactly one file, in the form field "${field}".`, at)
    }
    return new AppError('invalid_upload', 400, `The upload was refused: ${err.message}.`, at)
  }
  const message = err instanceof Error ? err.message : String(err)
  return new AppError('invalid_upload', 400, `The upload could not be read as multipart/form-data: ${message}.`, field)
}
