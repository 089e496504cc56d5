// Reading back the PNGs the program writes, pixel by pixel (RGB), for the picture tests.
import { PNG } from 'pngjs';

export type Px = [number, number, number];

export function decode(buf: Buffer) {
  const png = PNG.sync.read(buf);
  const at = (x: number, y: number): Px => {
    const i = (y * png.width + x) * 4;
    return [png.data[i]!, png.data[i + 1]!, png.data[i + 2]!];
  };
  return { width: png.width, height: png.height, at };
}
