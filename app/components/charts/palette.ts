/** The app's palette (app/app.css) for the charts, which draw outside Tailwind's classes. */
export const CHART_COLOURS = {
  bar: "#4d6f7a", // basalt-500
  flagged: "#a62a1c", // signal-700
  critical: "#a8600a", // ochre-600
  ink: "#13262c", // basalt-900
  grid: "#dde7ea", // basalt-100
  band: "#f1f5f6", // basalt-50
  repeatability: "#27454f", // basalt-700
  reproducibility: "#a8600a", // ochre-600
};
