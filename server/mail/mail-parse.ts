// A small MIME reader for the fake SMTP server: enough for what nodemailer sends (headers with
// encoded words, multipart/alternative, quoted-printable or base64 bodies, UTF-8). It is not a
// general mail parser; unknown parts are skipped.

export interface ParsedMail {
  subject: string
  text: string
  html?: string
  date: Date
}

interface Part {
  headers: Map<string, string>
  body: string // bytes as latin1 characters, still transfer-encoded
}

function splitPart(raw: string): Part {
  const cut = raw.search(/\r?\n\r?\n/)
  const head = cut < 0 ? raw : raw.slice(0, cut)
  const body = cut < 0 ? '' : raw.slice(cut).replace(/^\r?\n\r?\n/, '')
  const headers = new Map<string, string>()
  // Folded header lines start with white space and continue the previous header.
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':')
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim())
  }
  return { headers, body }
}

const utf8 = (latin1: string) => Buffer.from(latin1, 'latin1').toString('utf8')

function decodeQuotedPrintable(s: string): string {
  return s
    .replace(/=\r?\n/g, '')
    .replace(/=([0-9A-Fa-f]{2})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16)))
}

function decodeBody(part: Part): string {
  const encoding = (part.headers.get('content-transfer-encoding') ?? '7bit').toLowerCase()
  if (encoding === 'base64') return Buffer.from(part.body.replace(/\s+/g, ''), 'base64').toString('utf8')
  if (encoding === 'quoted-printable') return utf8(decodeQuotedPrintable(part.body))
  return utf8(part.body)
}

/** Decodes RFC 2047 encoded words (=?utf-8?Q?…?= and =?utf-8?B?…?=) in a header value. */
export function decodeHeader(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?') // white space between adjacent encoded words is not shown
    .replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_, _charset: string, kind: string, text: string) =>
      kind.toUpperCase() === 'B'
        ? Buffer.from(text, 'base64').toString('utf8')
        : utf8(decodeQuotedPrintable(text.replace(/_/g, ' '))),
    )
}

function boundaryOf(contentType: string): string | null {
  const m = /boundary="?([^";]+)"?/i.exec(contentType)
  return m?.[1] ?? null
}

function collect(part: Part, out: { text?: string; html?: string }): void {
  const type = (part.headers.get('content-type') ?? 'text/plain').toLowerCase()
  if (type.startsWith('multipart/')) {
    const boundary = boundaryOf(part.headers.get('content-type') ?? '')
    if (!boundary) return
    const pieces = part.body.split(`--${boundary}`)
    // pieces[0] is the preamble; the piece after the closing "--boundary--" starts with "--".
    for (const piece of pieces.slice(1)) {
      if (piece.startsWith('--')) break
      // The line break before a delimiter belongs to the delimiter (RFC 2046 section 5.1.1).
      collect(splitPart(piece.replace(/^\r?\n/, '').replace(/\r?\n$/, '')), out)
    }
    return
  }
  if (/attachment/i.test(part.headers.get('content-disposition') ?? '')) return
  if (type.startsWith('text/plain') && out.text === undefined) out.text = decodeBody(part)
  else if (type.startsWith('text/html') && out.html === undefined) out.html = decodeBody(part)
}

/** Reads subject, plain text, HTML and date from a raw RFC 5322 message (as received over SMTP). */
export function parseMail(raw: Buffer): ParsedMail {
  // The CRLF before SMTP's closing "." ends the transmission, not the body (RFC 5321 section 4.1.1.4).
  const top = splitPart(raw.toString('latin1').replace(/\r\n$/, ''))
  const out: { text?: string; html?: string } = {}
  collect(top, out)
  const dateHeader = top.headers.get('date')
  const date = dateHeader ? new Date(dateHeader) : new Date()
  return {
    subject: decodeHeader(utf8(top.headers.get('subject') ?? '')),
    text: (out.text ?? '').replace(/\r\n/g, '\n'),
    ...(out.html !== undefined ? { html: out.html } : {}),
    date: Number.isNaN(date.getTime()) ? new Date() : date,
  }
}
