// The caution every export carries (PRODUCT.md "Cautions shown with results"); someone may build
// from a downloaded file without ever seeing the app's screens.
export const CAUTION =
  'Form-finding results are preliminary. Loads, stresses, deflections, drainage under load, fabric ' +
  'patterning, anchors and connections must be checked by a qualified engineer under the codes that ' +
  'apply where the structure is built. Flat or nearly flat regions pond and flutter.'

/** The caution as comment lines with the given prefix ("# " for OBJ and CSV). */
export const cautionLines = (prefix: string): string => CAUTION.replace(/(.{1,90})(\s+|$)/g, `${prefix}$1\n`)
