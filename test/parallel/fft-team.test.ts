// An FFT team (src/parallel) against the transform of one thread: the same bits for every 2-D
// size, both directions and both kernels (a parallel split of a deterministic kernel must not
// change the arithmetic: common practice, hence exact equality rather than a tolerance; the
// one-thread transform itself is checked against fft.js and the DFT definition in
// test/optics/fft-fast.test.ts). Also: what the team declines, where samples are allocated, and
// that a helper that dies, hangs or fails neither hangs the caller nor changes the result.
import { spawnSync } from 'node:child_process';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import * as sourceTeam from '../../src/parallel/fft-team.js';
import type { Engine } from '../../src/optics/engine.js';
import { fromDist, distFile, type EngineModule, type FastModule, type FieldModule, type KernelsModule, type TeamModule } from './dist.js';
import { randomComplex, sameBits, sharedCopy } from './fft-data.js';
import { directDft } from '../reference/dft.js';
import { defaultBackend } from '../optics/native-fft.js';

let team: TeamModule;
let base: Engine;
/** The engine of the team started last (startFftTeam). */
let teamEngine: Engine;
let fast: FastModule;
let field: FieldModule;

beforeAll(async () => {
  team = await fromDist<TeamModule>('parallel/fft-team.js');
  const engines = await fromDist<EngineModule>('optics/engine.js');
  fast = await fromDist<FastModule>('optics/fft-fast.js');
  field = await fromDist<FieldModule>('optics/field.js');
  base = engines.singleThreadEngine((await fromDist<KernelsModule>('kernels.js')).createKernel());
  expect(fast.fastFftBackend(base.kernel)).toBe(defaultBackend);
});

/** Starts a team from the one-thread engine; resolves to the threads ready. */
async function start(threads: number, opts: Parameters<TeamModule['startFftTeam']>[2] = {}): Promise<number> {
  teamEngine = await team.startFftTeam(threads, base, opts);
  return teamEngine.threads;
}

afterEach(async () => {
  await team.stopFftTeam();
  fast.useFastFftBackend(base.kernel, 'wasm-simd');
});

/** One thread's transform of a copy of x. */
function serial(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const y = x.slice();
  fast.fft2Interleaved(base.kernel, y, nx, ny, inverse);
  return y;
}

/** The team's transform (through its engine's fft2, as the program calls it) of a shared copy of x. */
function viaTeam(x: Float64Array, nx: number, ny: number, inverse: boolean): Float64Array {
  const y = sharedCopy(x);
  teamEngine.fft2(y, nx, ny, inverse);
  return y;
}

describe('where teams can start', () => {
  it('from the compiled program, yes; from the TypeScript sources, no team and nothing changes', async () => {
    expect(team.teamsAvailable()).toBe(true);
    expect(sourceTeam.teamsAvailable()).toBe(false);
    // the engine given back is the one it was to be made from (on the WebAssembly kernel: the
    // native one needs no helper threads, below)
    fast.useFastFftBackend(base.kernel, 'wasm-simd');
    expect(await sourceTeam.startFftTeam(2, base)).toBe(base);
    expect(sourceTeam.fftTeamSize()).toBe(1);
  });
});

describe.each(['wasm-simd', 'js'] as const)('%s kernel: a team of 2 equals one thread bit for bit', (backend) => {
  // Powers of two, and 5-smooth sizes, odd and even (the last part of a phase shorter, ending on
  // an odd column where nx is odd).
  const shapes: [number, number][] = [[64, 128], [256, 256], [512, 256], [128, 32], [360, 45], [45, 360], [1125, 24], [100, 100]];
  for (const inverse of [false, true]) {
    it(`${shapes.map(([a, b]) => `${a}×${b}`).join(', ')}, ${inverse ? 'inverse' : 'forward'}`, async () => {
      fast.useFastFftBackend(base.kernel, backend);
      // Parts by the helper only (this thread draws none: certain however busy the machine is),
      // then shared as they come, which on a busy machine may be all by this thread.
      for (const idle of [true, false]) {
        expect(await start(2, { minValues: 1024, callerIdleForTests: idle })).toBe(2);
        for (let round = 0; round < 3; round++) {
          for (const [nx, ny] of shapes) {
            const x = randomComplex(nx * ny, 13 * nx + ny + round);
            expect(sameBits(viaTeam(x, nx, ny, inverse), serial(x, nx, ny, inverse)), `${nx}×${ny} round ${round}`).toBe(true);
          }
        }
        const f = team.fftTeamFigures();
        expect(f.transforms).toBe(3 * shapes.length);
        // the WebAssembly kernel works in the team's shared memory, the TypeScript one in copied parts
        expect(f.inSharedMemory).toBe(backend === 'wasm-simd' ? f.transforms : 0);
        if (idle) expect(f.partsByHelpers).toBeGreaterThan(0);
        expect(f.takeovers).toBe(0);
        await team.stopFftTeam();
      }
    });
  }
});

describe.each(['wasm-simd', 'js'] as const)('%s kernel: a team of 2 at sizes that are not powers of two', (backend) => {
  it('equals the DFT definition summed directly (test/reference/dft.ts) to 1e-12 relative, 45×100 and 100×45', async () => {
    fast.useFastFftBackend(base.kernel, backend);
    expect(await start(2, { minValues: 1024, callerIdleForTests: true })).toBe(2);
    for (const [nx, ny] of [[45, 100], [100, 45]] as const) {
      for (const inverse of [false, true]) {
        const x = randomComplex(nx * ny, nx + 3 * ny);
        const ref = directDft(x, nx, ny, inverse);
        const got = viaTeam(x, nx, ny, inverse);
        let d = 0, m = 0;
        for (let i = 0; i < ref.length; i++) {
          d = Math.max(d, Math.abs(got[i]! - ref[i]!));
          m = Math.max(m, Math.abs(ref[i]!));
        }
        expect(d / m, `${nx}×${ny} ${inverse ? 'inverse' : 'forward'}`).toBeLessThan(1e-12);
      }
    }
    const f = team.fftTeamFigures();
    expect(f.transforms).toBe(4);
    expect(f.partsByHelpers).toBeGreaterThan(0);
  });
});

describe('what the team leaves to one thread', () => {
  it('1-D transforms, transforms below the size threshold, and data not in shared memory', async () => {
    expect(await start(2, { minValues: 2 ** 14 })).toBe(2);
    const cases: [string, Float64Array, number, number][] = [
      ['1-D', sharedCopy(randomComplex(2 ** 16, 1)), 2 ** 16, 1],
      ['small', sharedCopy(randomComplex(64 * 128, 2)), 64, 128],
      ['not shared', randomComplex(256 * 256, 3), 256, 256],
    ];
    for (const [what, x, nx, ny] of cases) {
      const ref = serial(x, nx, ny, false);
      teamEngine.fft2(x, nx, ny, false);
      expect(sameBits(x, ref), what).toBe(true);
    }
    expect(team.fftTeamFigures().transforms).toBe(0);
    // and the one that qualifies is taken
    const x = randomComplex(256 * 256, 4);
    expect(sameBits(viaTeam(x, 256, 256, false), serial(x, 256, 256, false))).toBe(true);
    expect(team.fftTeamFigures().transforms).toBe(1);
  });

  it('errors stay those of one thread (sizes with a prime factor above 5, wrong lengths)', async () => {
    await start(2, { minValues: 16 });
    expect(() => teamEngine.fft2(new Float64Array(new SharedArrayBuffer(8 * 2 * 14 * 8)), 14, 8, false)).toThrow(/no prime factor but 2, 3 and 5/);
    expect(() => teamEngine.fft2(new Float64Array(new SharedArrayBuffer(8 * 30)), 4, 4, false)).toThrow(/values for a 4×4/);
  });

  it("large sample arrays from a team's engine are shared while the team runs, small ones and all after it are not", async () => {
    const big = (e: Engine) => field.createField({ n: 512, start: 0, step: 1 }, { n: 512, start: 0, step: 1 }, 1e-6, e.allocate).data.buffer;
    const small = (e: Engine) => field.createField({ n: 64, start: 0, step: 1 }, { n: 64, start: 0, step: 1 }, 1e-6, e.allocate).data.buffer;
    expect(big(base)).toBeInstanceOf(ArrayBuffer);
    await start(2);
    expect(big(teamEngine)).toBeInstanceOf(SharedArrayBuffer);
    expect(small(teamEngine)).toBeInstanceOf(ArrayBuffer);
    // the one-thread engine is not changed by the team
    expect(big(base)).toBeInstanceOf(ArrayBuffer);
    await team.stopFftTeam();
    expect(big(teamEngine)).toBeInstanceOf(ArrayBuffer);
    expect(team.fftTeamSize()).toBe(1);
  });
});

describe.each(['wasm-simd', 'js'] as const)('%s kernel: a helper that is lost mid-transform', (backend) => {
  // The faults show in the helper's first part (a row part; 'exit-while-writing': the first part it
  // writes, which with the shared memory is a part of the last phase, copying the result out).
  const faults = ['exit-after-claim', 'hang-after-claim', 'exit-while-writing', 'throw'] as const;
  it.each(faults)('%s: the caller finishes alone, with the same bits, stops the team and says why', async (fault) => {
    fast.useFastFftBackend(base.kernel, backend);
    const problems: string[] = [];
    // The caller draws no parts, so the helper's first part (and its fault) comes with the first
    // transform however busy the machine is.
    expect(
      await start(2, { minValues: 1024, stallMs: 200, faultForTests: fault, callerIdleForTests: true, onProblem: (m) => problems.push(m) }),
    ).toBe(2);
    const [nx, ny] = [512, 256];
    let rounds = 0;
    // The fault shows in the helper's first part; until the helper takes one, the caller does all.
    while (team.fftTeamFigures().takeovers === 0 && rounds < 100) {
      const x = randomComplex(nx * ny, 100 + rounds++);
      expect(sameBits(viaTeam(x, nx, ny, rounds % 2 === 0), serial(x, nx, ny, rounds % 2 === 0)), `round ${rounds}`).toBe(true);
    }
    const f = team.fftTeamFigures();
    expect(f.takeovers).toBe(1);
    expect(f.problem).toMatch(fault === 'throw' ? /failed/ : /did not answer for 0.2 s/);
    expect(problems).toEqual([f.problem]);
    expect(team.fftTeamSize()).toBe(1);
    // fft2 is back to one thread and still right
    const x = randomComplex(nx * ny, 7);
    expect(sameBits(viaTeam(x, nx, ny, false), serial(x, nx, ny, false))).toBe(true);
    expect(team.fftTeamFigures().transforms).toBe(f.transforms);
  });
});

it("a library caller's process ends although its team was never stopped", () => {
  const script = `
    const { createEngine } = await import(${JSON.stringify(distFile('kernels.js'))});
    const { startFftTeam, fftTeamFigures } = await import(${JSON.stringify(distFile('parallel/fft-team.js'))});
    const engine = await startFftTeam(2, createEngine(), { onProblem: (m) => console.error(m) });
    console.log(engine.threads);
    const d = new Float64Array(new SharedArrayBuffer(8 * 2 * 512 * 512));
    d[0] = 1;
    engine.fft2(d, 512, 512, false);
    console.log(fftTeamFigures().transforms, d[2 * 1000 + 1] === 0 && d[2 * 1000] === 1);
  `;
  const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', timeout: 20_000 });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
  // a unit impulse at the origin transforms to all ones (DFT definition)
  expect(r.stdout.trim().split('\n')).toEqual(['2', '1 true']);
});
