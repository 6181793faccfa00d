/**
 * Draws the browser icons in public/ from the Ringbatch mark (app/components/wordmark.tsx):
 * favicon.svg, and PNGs rendered from it by sharp (32×32 favicon, 180×180 home-screen icon).
 * Run once after changing the mark: `npx tsx scripts/make-icons.ts`.
 */
import { writeFileSync } from "node:fs";
import sharp from "sharp";

const BASALT_800 = "#1c343c";
const BASALT_50 = "#f1f5f6";
const OCHRE_300 = "#f0c46f";

// The mark's geometry: eight sample points on a ring around one shared batch, on a 32-unit square.
const points = Array.from({ length: 8 }, (_, i) => {
  const angle = (i / 8) * 2 * Math.PI - Math.PI / 2;
  return [16 + 11 * Math.cos(angle), 16 + 11 * Math.sin(angle)].map((v) => Number(v.toFixed(3)));
});

const svg = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32">
  <rect width="32" height="32" rx="6" fill="${BASALT_800}"/>
  <circle cx="16" cy="16" r="11" fill="none" stroke="${BASALT_50}" stroke-opacity="0.45" stroke-width="1.5"/>
${points.map(([x, y]) => `  <circle cx="${x}" cy="${y}" r="2.4" fill="${BASALT_50}"/>`).join("\n")}
  <rect x="12" y="12" width="8" height="8" rx="1.5" fill="${OCHRE_300}"/>
</svg>
`;

writeFileSync("public/favicon.svg", svg);
for (const [file, size] of [["public/favicon.png", 32], ["public/apple-touch-icon.png", 180]] as const) {
  await sharp(Buffer.from(svg), { density: (72 * size) / 32 }).resize(size, size).png().toFile(file);
}
console.log("Wrote public/favicon.svg, public/favicon.png, public/apple-touch-icon.png");
