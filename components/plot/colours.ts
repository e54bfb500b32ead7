// The plot frame's ink and accent, kept apart from its drawing code so pages may use them without
// loading the chart library.
export const PLOT_INK = '#1d1b18';
export const PLOT_ACCENT = '#1f5f5b';
