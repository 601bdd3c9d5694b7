/**
 * One percent-encoded path segment decoded, or null when it is malformed (a % not followed by two
 * hex digits, or bytes that are not UTF-8), where decodeURIComponent would throw a URIError.
 */
export function decodePathSegment(segment: string): string | null {
  try {
    return decodeURIComponent(segment)
  } catch {
    return null
  }
}
