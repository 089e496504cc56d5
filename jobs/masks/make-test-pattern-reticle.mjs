// Draws test-pattern-reticle.png, the mask of the demo job test-pattern-reticle.yaml (an invented
// pattern): 40 × 40 pixels, black (opaque) with, in white (open), a square frame 3 pixels wide, a
// centre cross 2 pixels wide, and an L-shaped mark in the top-left quadrant that tells the pattern from its mirror
// image; in the bottom-right quadrant a square patch at grey 128 (amplitude transmission 0.502,
// power 0.252). Row 0 is the top row. Run from the project's root: node jobs/masks/make-test-pattern-reticle.mjs
import { writeFileSync } from 'node:fs';
import { PNG } from 'pngjs';

const N = 40;
const grey = new Uint8Array(N * N);
const fill = (i0, i1, k0, k1, v) => {
  for (let k = k0; k <= k1; k++) for (let i = i0; i <= i1; i++) grey[k * N + i] = v;
};
// Frame: outer edge 2 pixels in from the image's edge, 3 pixels wide.
fill(2, 37, 2, 4, 255);
fill(2, 37, 35, 37, 255);
fill(2, 4, 2, 37, 255);
fill(35, 37, 2, 37, 255);
// Centre cross: arms 2 pixels wide and 16 long, crossing at the image's centre.
fill(12, 27, 19, 20, 255);
fill(19, 20, 12, 27, 255);
// L mark, top-left quadrant: a 2 × 7 upright and a 5 × 2 foot.
fill(8, 9, 7, 13, 255);
fill(8, 12, 12, 13, 255);
// Grey patch, bottom-right quadrant: 6 × 6 pixels at 128/255.
fill(26, 31, 26, 31, 128);

const png = new PNG({ width: N, height: N, colorType: 0, inputColorType: 0, inputHasAlpha: false, bitDepth: 8 });
png.data = Buffer.from(grey);
const url = new URL('./test-pattern-reticle.png', import.meta.url);
writeFileSync(url, PNG.sync.write(png, { colorType: 0, inputColorType: 0, inputHasAlpha: false, bitDepth: 8 }));
console.log(`wrote ${url.pathname}`);
