// The job's `spectrum` key: light of several wavelengths at once, added in intensity (the lines of
// a lamp are mutually incoherent). Four forms: a list of lines with their powers, a flat band, a
// blackbody's band (Planck's law), or a table of spectral power density read from a CSV file. The
// band forms give a number of samples the planner may refine (plan/spectrum.ts); the CSV's own
// rows are its samples.
import { z } from 'zod';
import { WAVELENGTH, mappingError, positiveLength } from './quantities.js';

/** At most this many lines or band samples: each is one propagation. */
export const SPECTRUM_LINES_MAX = 1000;
export const BAND_SAMPLES_MIN = 2;

const wavelength = positiveLength(WAVELENGTH);
const powerMsg = 'expected a relative power: a number above 0 (such as 1 or 0.5)';
const power = z.number({ error: powerMsg }).gt(0, { error: powerMsg }).max(1e30, { error: powerMsg }).refine(Number.isFinite, { error: powerMsg });

const lineOne = z.strictObject(
  { wavelength, power: power.default(1) },
  { error: mappingError("expected a line such as {wavelength: '589.0 nm', power: 1}") },
);
const linesMsg = `expected a list of 1 to ${SPECTRUM_LINES_MAX} lines, each {wavelength, power}`;
const lines = z.array(lineOne, { error: linesMsg }).min(1, { error: linesMsg }).max(SPECTRUM_LINES_MAX, { error: linesMsg });

const samplesMsg = `expected a whole number of wavelength samples from ${BAND_SAMPLES_MIN} to ${SPECTRUM_LINES_MAX}`;
const samples = z.number({ error: samplesMsg }).int({ error: samplesMsg }).min(BAND_SAMPLES_MIN, { error: samplesMsg }).max(SPECTRUM_LINES_MAX, { error: samplesMsg });

const bandShape = { from: wavelength, to: wavelength };
const band = z.strictObject(bandShape, { error: mappingError("expected a mapping such as {from: '400 nm', to: '700 nm'}") });

/** A temperature in kelvin: a number, or text such as '3000 K'. */
const temperatureMsg = "expected a temperature in kelvin from 100 K to 100000 K, such as 3000 or '3000 K'";
const temperature = z.unknown().transform((raw, ctx): number => {
  let v = NaN;
  if (typeof raw === 'number') v = raw;
  else if (typeof raw === 'string') {
    const m = /^\s*([0-9]+(?:\.[0-9]*)?(?:[eE][+-]?[0-9]+)?)\s*K\s*$/.exec(raw);
    if (m) v = Number(m[1]);
  }
  if (!(v >= 100 && v <= 1e5)) {
    ctx.addIssue({ code: 'custom', message: temperatureMsg });
    return z.NEVER;
  }
  return v;
});
const blackbody = z.strictObject(
  { temperature, ...bandShape },
  { error: mappingError("expected a mapping such as {temperature: 3000, from: '400 nm', to: '700 nm'}") },
);

const fileMsg = 'expected the name of a CSV file of (wavelength, power) rows, such as lamp.csv';
const file = z.string({ error: fileMsg }).min(1, { error: fileMsg }).max(4096, { error: fileMsg });

export const SPECTRUM_KEYS = ['lines', 'band', 'blackbody', 'file', 'samples'];

/**
 * The key as written: exactly one of lines, band, blackbody, file; `samples` with a band or a
 * blackbody only. A file's rows are attached by the loader (load.ts) as `table`.
 */
export const spectrumSchema = z
  .strictObject(
    {
      lines: lines.optional(),
      band: band.optional(),
      blackbody: blackbody.optional(),
      file: file.optional(),
      samples: samples.optional(),
    },
    { error: mappingError("expected a mapping such as {lines: [{wavelength: '589.0 nm', power: 2}, {wavelength: '589.6 nm', power: 1}]} or {band: {from: '400 nm', to: '700 nm'}, samples: 31}") },
  )
  .superRefine((s, ctx) => {
    const forms = (['lines', 'band', 'blackbody', 'file'] as const).filter((k) => s[k] !== undefined);
    if (forms.length !== 1) {
      ctx.addIssue({
        code: 'custom',
        path: forms.length > 1 ? [forms[1]!] : [],
        message: forms.length > 1 ? `expected one of lines, band, blackbody or file, not both ${forms[0]} and ${forms[1]}` : 'expected one of lines, band, blackbody or file',
      });
    }
    if (s.samples !== undefined && (s.lines || s.file)) {
      ctx.addIssue({ code: 'custom', path: ['samples'], message: `expected no samples with ${s.lines ? 'lines (each line is computed as given)' : 'a file (its rows are the samples)'}` });
    }
    const b = s.band ?? s.blackbody;
    if (b && !(b.from < b.to)) ctx.addIssue({ code: 'custom', path: [s.band ? 'band' : 'blackbody', 'to'], message: "expected 'to' longer than 'from'" });
  });

export type SpectrumInput = z.output<typeof spectrumSchema>;
