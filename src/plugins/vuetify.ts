// Vuetify with SVG icons bundled from @mdi/js (nothing fetched at run time) and Cutline's theme.
import 'vuetify/styles';
import { createVuetify } from 'vuetify';
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg';
import { vuetifyThemeColours } from './theme-colours';

export const vuetify = createVuetify({
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  theme: {
    defaultTheme: 'cutline',
    themes: {
      cutline: {
        dark: false,
        colors: vuetifyThemeColours,
        // Secondary text (labels, hints, subtitles) is drawn at this opacity, and a field's label
        // at its square (label inside a label): 0.78 keeps both at 4.5:1 on white and on the page
        // background (Vuetify's 0.6 gave labels about 2.8:1; WCAG 2.1 SC 1.4.3).
        variables: { 'medium-emphasis-opacity': 0.78 },
      },
    },
  },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined', density: 'comfortable' },
  },
});
