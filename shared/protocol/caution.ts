/**
 * The caution every result carries: the UI, every download, the CLI's files and the printed report
 * (PRODUCT.md "Cautions shown with results"). Someone may build from a downloaded file without ever
 * seeing the app's screens, so the file says it too.
 */
export const CAUTION =
  'Form-finding results are preliminary. Loads, stresses, deflections, drainage under load, fabric ' +
  'patterning, anchors and connections must be checked by a qualified engineer under the codes that ' +
  'apply where the structure is built. Flat or nearly flat regions pond and flutter: the app flags them. ' +
  'Cutting patterns are checked by the fabricator against the biaxial test of the actual fabric batch ' +
  'before anything is cut.'

/** A short title for the caution (UI alert heading, STL solid name). */
export const CAUTION_TITLE = 'Preliminary form-finding result'

/** The caution as comment lines of at most ~90 characters with the given prefix ("# " for OBJ and CSV). */
export const cautionLines = (prefix: string): string => CAUTION.replace(/(.{1,90})(\s+|$)/g, `${prefix}$1\n`)
