// Vuetify: Roboto shipped with the app (latin only), inline SVG icons from @mdi/js, our own calm
// theme, and the defaults that keep styling props out of the views.
import '@fontsource/roboto/latin-400.css'
import '@fontsource/roboto/latin-500.css'
import '@fontsource/roboto/latin-700.css'
import 'vuetify/styles'
import { createVuetify, type ThemeDefinition } from 'vuetify'
import { VBtn } from 'vuetify/components/VBtn'
import { VCard } from 'vuetify/components/VCard'
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg'

/** Ink blue on paper, a muted teal accent: quiet enough for long sessions over plots. */
const fieldNotes: ThemeDefinition = {
  dark: false,
  colors: {
    background: '#f6f7f9',
    surface: '#ffffff',
    primary: '#28507a',
    secondary: '#4d7c7a',
    accent: '#8a6d3b',
    error: '#b3261e',
    warning: '#a86b00',
    info: '#3d6f9e',
    success: '#2e7d4f',
  },
}

export function makeVuetify() {
  return createVuetify({
    icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
    theme: { defaultTheme: 'fieldNotes', themes: { fieldNotes } },
    aliases: {
      /** The one filled button of a form or dialog. */
      VBtnPrimary: VBtn,
      /** Small text button in tables and toolbars. */
      VBtnQuiet: VBtn,
      /** A page section: title, content, actions. */
      VCardSection: VCard,
    },
    defaults: {
      VBtn: { variant: 'text' },
      VBtnPrimary: { color: 'primary', variant: 'flat' },
      VBtnQuiet: { variant: 'text', size: 'small', density: 'comfortable' },
      VCard: { variant: 'flat', rounded: 'lg', border: true },
      VCardSection: { variant: 'flat', rounded: 'lg', border: true, class: 'mb-4' },
      VTextField: { variant: 'outlined', density: 'comfortable', validateOn: 'blur input' },
      VTextarea: { variant: 'outlined', density: 'comfortable', rows: 2, autoGrow: true },
      VSelect: { variant: 'outlined', density: 'comfortable' },
      VFileInput: { variant: 'outlined', density: 'comfortable' },
      VDataTable: { density: 'compact', hover: true },
      VAlert: { variant: 'tonal', density: 'compact', class: 'my-2' },
      VAppBar: { color: 'primary', density: 'comfortable', flat: true },
      VChip: { size: 'small', variant: 'tonal' },
      VSwitch: { color: 'primary', density: 'compact', hideDetails: true, inset: true },
      VDialog: { maxWidth: 520 },
      VProgressLinear: { indeterminate: true, color: 'primary' },
    },
  })
}

export default makeVuetify()
