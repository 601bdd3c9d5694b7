// Text fields read from requests. A name lands on one line of an OBJ or CSV header, in a mail
// subject and in the plain-text invite: a line break or control character in it would add lines
// there (issue 12, item 7), so names refuse them at validation instead of being cleaned later.
import { z } from 'zod'

// C0 and C1 control characters (NUL, CR, LF, tab, ESC, …), DEL, and the Unicode line and
// paragraph separators, which some mail and text readers also break lines at.
// eslint-disable-next-line no-control-regex -- matching control characters is the point
const LINE_BREAKING = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/
// Multi-line text keeps tab, LF and CR; every other control character is still refused.
// eslint-disable-next-line no-control-regex -- as above
const CONTROL_IN_TEXT = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/
// A high surrogate not followed by a low one, or a low one not preceded by a high one: not valid
// UTF-16, and stored as U+FFFD by MariaDB's utf8mb4, so the saved name would differ from the sent one.
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/

const wellFormed = (s: string) => !LONE_SURROGATE.test(s)

/** A one-line name (room, snapshot, person): trimmed, 1–max characters, no control characters. */
export const nameField = (max: number) =>
  z
    .string('text')
    .refine((s) => !LINE_BREAKING.test(s), 'no line breaks, tabs or other control characters')
    .refine(wellFormed, 'contains a broken character (an unpaired UTF-16 surrogate)')
    .trim()
    .min(1, 'required')
    .max(max, `at most ${max} characters`)

/** Free text over several lines (description, note, comment): trimmed, at most max characters. */
export const multiLineField = (max: number) =>
  z
    .string('text')
    .refine((s) => !CONTROL_IN_TEXT.test(s), 'no control characters other than line breaks and tabs')
    .refine(wellFormed, 'contains a broken character (an unpaired UTF-16 surrogate)')
    .trim()
    .max(max, `at most ${max} characters`)

/**
 * The text on one line, for output built from values stored before names were checked: control
 * characters become spaces, unpaired surrogates U+FFFD.
 */
export const oneLine = (s: string): string =>
  s.replace(new RegExp(LINE_BREAKING.source, 'g'), ' ').replace(new RegExp(LONE_SURROGATE.source, 'g'), '\ufffd')
