import type { GlobalThemeOverrides } from 'naive-ui'

/**
 * Veilroom's own palette: a deep slate-teal for actions (the colour of wet canvas in shade) with a
 * warm sand accent (sunlit fabric). Chosen for contrast on a warm off-white page, not taken from
 * any other product.
 */
export const palette = {
  slateTeal: '#2f5d62',
  slateTealDeep: '#24484d',
  sand: '#d8bf94',
  sandDeep: '#b8955c',
  paper: '#f7f4ee',
  ink: '#1e2a2c',
  clay: '#b4553d',
} as const

const fontFamily = "'Work Sans', system-ui, -apple-system, 'Segoe UI', sans-serif"

export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily,
    fontWeightStrong: '600',
    primaryColor: palette.slateTeal,
    primaryColorHover: '#3b7278',
    primaryColorPressed: palette.slateTealDeep,
    primaryColorSuppl: '#3b7278',
    infoColor: '#4a6f8a',
    infoColorHover: '#5a819d',
    infoColorPressed: '#3c5c73',
    warningColor: palette.sandDeep,
    warningColorHover: '#c6a46c',
    warningColorPressed: '#9c7c49',
    errorColor: palette.clay,
    errorColorHover: '#c4664d',
    errorColorPressed: '#9a4532',
    successColor: '#4f7a52',
    bodyColor: palette.paper,
    textColorBase: palette.ink,
    borderRadius: '6px',
  },
  Layout: {
    color: palette.paper,
    headerColor: palette.slateTealDeep,
  },
  Card: {
    borderRadius: '10px',
  },
}
