// Cutline's theme colours, one place for the Vuetify theme and the contrast test. Text on the
// accent and the primary, and warning text on white, keep 4.5:1 (WCAG 2.1 SC 1.4.3).
export const vuetifyThemeColours = {
  primary: '#1d3b53',
  secondary: '#4f6d7a',
  accent: '#b5521f',
  error: '#b3261e',
  warning: '#8a5200',
  success: '#2e7d4f',
  background: '#f4f6f8',
  surface: '#ffffff',
};
