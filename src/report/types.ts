// What a job's report, plots and contact sheet are made from: plain data, gathered by the runner
// from the case results (no I/O here).

/** One swept key of the job. */
export interface SweepKey {
  /** Dotted key path in the job file, e.g. "distance" or "aperture.diameter". */
  key: string;
  /** Axis label for people, e.g. "distance". */
  label: string;
  /** "m" for lengths (values in metres), "1" for counts. */
  unit: 'm' | '1';
  /** How the values were given: log-spaced sweeps get log axes. */
  spacing: 'list' | 'linear' | 'log';
  values: number[];
}

/** A metric as it appears in tables and plots. */
export interface MetricInfo {
  key: string;
  label: string;
  /** "m" lengths, "1" dimensionless (fractions, relative intensities). */
  unit: 'm' | '1';
  /** Plot on a log axis by default (e.g. intensities that span decades). */
  log?: boolean;
  /** Drawn with the other metrics of this chart, as one of its series (a reference as a line only). */
  chart?: { name: string; reference?: boolean };
}

export interface ReportCase {
  id: string;
  /** Case folder relative to the job folder. */
  folder: string;
  /** missing: not (yet) computed — a shard still at work, or a run that stopped before it. */
  status: 'done' | 'failed' | 'missing';
  error?: string;
  /** Values of the swept keys for this case (SI), by key path. */
  swept: Record<string, number>;
  wavelength: number;
  distance: number;
  fresnelNumber: number | null;
  regime: string | null;
  method: string | null;
  /** Flat numeric metrics by MetricInfo.key (null where not defined for this case). */
  metrics: Record<string, number | null>;
  warnings: { code: string; message: string }[];
  reasons: string[];
  /** One-sentence verdict (diffraction-limited or not, by what factor), when one applies. */
  verdict?: string;
  /** Cautions on reading the case's numbers (a D4σ that depends on the window). */
  notes?: string[];
  /** Relative path of the case's picture (intensity.png), when the case is done. */
  picture?: string;
  /** Relative path of the case's MTF plot (mtf.png), when it has one (lens cases at their focus). */
  mtfPlot?: string;
  /** A 1-D result's profile plot (profile.png) and a 2-D result's zoomed picture (intensity-zoom.png), where written. */
  profilePlot?: string;
  zoom?: string;
  /** The smallest-spot search's plot (smallest-spot.png), where the job asked for the search. */
  searchPlot?: string;
  /** The encircled-energy plot (encircled-energy.png) of a 2-D result. */
  energyPlot?: string;
  /** Light of several wavelengths: the true-colour picture (colour.png). */
  colour?: string;
}

export interface ReportTable {
  title: string;
  header: string[];
  rows: (string | number | null)[][];
  note?: string;
  /**
   * Columns of long sentences: each cell shows its first clause (up to the first colon) and folds
   * the rest under it, so that the table reads at a glance.
   */
  fold?: number[];
}

export interface ReportPlot {
  title: string;
  /** Relative paths of the written files. */
  svg: string;
  png: string;
}

export interface JobReport {
  job: string;
  file: string;
  description?: string;
  /** The job as written (parsed YAML/JSON). */
  given: unknown;
  toolVersion: string;
  createdAt: string;
  sweeps: SweepKey[];
  metrics: MetricInfo[];
  cases: ReportCase[];
  tables: ReportTable[];
  plots: ReportPlot[];
  /**
   * The axial intensity against distance, densely (analysis/on-axis.ts), where the job sweeps the
   * distance of one aperture and light that have an exact axial form.
   */
  onAxis?: { z: number[]; intensity: number[]; how: string };
  /** Relative path of the contact sheet PNG, when there is more than one done case. */
  contactSheet?: string;
  /** The same sheet with each tile's brightness in decades below its peak. */
  contactSheetLog?: string;
  /** The explorer page beside the report (report/explorer.ts), relative to the job folder. */
  explorer?: string;
  /** Plans in words, one block per case (as `spotcast plan` prints them). */
  plans: string[];
}
