/**
 * The setup file (docs/data-format.md §4): model geometry, tunnel section, balance axes, gas, ambient
 * defaults, wall-correction choices. Described once, here: each field's validation, default and
 * metadata (label, unit, help; the sane range is its zod check) live in one entry, and from them come
 * the `Setup` type, the window's setup form (core/setup/fields.ts), docs/setup.md and
 * docs/setup.schema.json (`npm run docs:setup`). Validated with zod; every problem names its field.
 *
 * Adding a field is adding one entry to its block below, with `.meta({ label, unit, help })` and a
 * `.default(...)` that keeps existing setups unchanged (DEVELOPERS.md, "Adding a setup field").
 */
import { z } from 'zod';
import { InputError, type Notice } from '../contract/messages.ts';
import './fieldMeta.ts';
import { checkBalanceAxes, validateBalance, type Balance } from '../balance/document.ts';
import { checkMounting, tunnelSectionOf, type Boundaries, type Mounting } from '../walls/sections.ts';
import { DEFAULT_FINENESS_RATIO, shapeFactorK } from '../walls/shapeFactor.ts';

const positive = (what: string) =>
  z
    .number({ error: `expected a number (${what})` })
    .finite()
    .positive({ error: `expected a positive number (${what})` });
const finite = (what: string) => z.number({ error: `expected a number (${what})` }).finite();
/**
 * Geometry within a sanity range (common sense, no published source): no wind-tunnel model or test section
 * is smaller than 0.1 mm or larger than 1 km, so lengths lie in [1e-4, 1e3] m, areas in [1e-8, 1e6] m² and
 * volumes in [1e-12, 1e9] m³. A mistyped exponent (1e-300, 1e300) then gets a message naming the field
 * instead of overflowing coefficients and uncertainties downstream (fuzz finding).
 */
const geometry = (what: string, unit: 'm' | 'm²' | 'm³') => {
  const [lo, hi] = unit === 'm' ? [1e-4, 1e3] : unit === 'm²' ? [1e-8, 1e6] : [1e-12, 1e9];
  const error = `expected ${lo} to ${hi} ${unit} (${what})`;
  return positive(`${what}, ${unit}`).min(lo, { error }).max(hi, { error });
};
/** A number within a sane range; out of range, the message gives the range (not just "expected a number"). */
const inRange = (what: string, lo: number, hi: number, unit: string) => {
  const error = unit ? `expected ${lo} to ${hi}${unit}` : `expected ${lo} to ${hi} (${what})`;
  return finite(what).min(lo, { error }).max(hi, { error });
};
/**
 * Sane ranges for the numbers a person types into a setup (common sense, no published bound): wide
 * enough for every closed test section and model, narrow enough that a slipped decimal point (δ = 11.5
 * for 0.115) gets a message naming the field instead of a reduction with α of 130°. Typical values, from
 * memory of Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing (3rd ed.) ch. 9–10: δ 0.1–0.14 for closed
 * rectangular sections (negative only for open jets), τ1 0.8–0.95, τ2 0–0.3, K 0.74 (2D) to about 1.
 */
export const SETUP_RANGES = {
  delta: [-0.5, 0.5],
  tau1: [0, 2],
  tau2: [0, 1],
  solid_blockage_k: [0.1, 2],
  /** Moment-reference offset, in reference chords either way. */
  moment_ref_offset_chords: 10,
  p_pa: [1e3, 5e6],
} as const;
/** A standard uncertainty: zero or more, and at most `hi` (far beyond any instrument worth the name). */
const uncertainty = (what: string, hi: number) =>
  finite(what)
    .nonnegative({ error: `expected zero or more (${what})` })
    .max(hi, { error: `expected 0 to ${hi} (${what})` });
/** A wall-correction factor within its sane range: a number overrides, `null` (the default) means computed for this tunnel and model. */
const optionalFactor = (what: string, [lo, hi]: readonly [number, number]) =>
  z
    .number({ error: `expected a number or null (${what})` })
    .finite()
    .min(lo, { error: `expected ${lo} to ${hi} (${what})` })
    .max(hi, { error: `expected ${lo} to ${hi} (${what})` })
    .nullable()
    .default(null);

// ---- tunnels and mountings: names ----
export const SECTIONS = ['closed-rectangular', 'open-rectangular', 'rectangular', 'closed-circular', 'open-circular'] as const;
export type SectionName = (typeof SECTIONS)[number];
const WALLS = ['floor', 'ceiling', 'left', 'right'] as const;
const boundary = (side: string) =>
  z.enum(['solid', 'free'], { error: 'expected "solid" or "free"' }).meta({ label: `Boundary: ${side}`, help: 'section "rectangular" only', choices: { solid: 'solid wall', free: 'free (jet boundary)' } });
// ---- end tunnels and mountings ----

const modelSchema = z
  .strictObject({
    kind: z.enum(['2d', '3d'], { error: 'expected "2d" (a wing spanning the tunnel) or "3d"' }).meta({
      label: 'Model',
      details: '`2d`: a wing section spanning the tunnel width between solid side walls. `3d`: a model in the test section; needs `area_m2`, `chord_m` and `span_m`.',
      choices: { '3d': '3D model', '2d': '2D wing spanning the section' },
    }),
    name: z.string().optional().meta({ label: 'Name', details: 'For people; not used by the reduction.' }),
    area_m2: geometry('reference area', 'm²').optional().meta({
      label: 'Reference area S',
      unit: 'm²',
      help: '3D only; a 2D model uses chord × tunnel width',
      details: 'Required for a 3D model. For a 2D model the reference area is chord × tunnel width; a value that disagrees gets a warning and is not used.',
    }),
    chord_m: geometry('reference chord', 'm').meta({
      label: 'Reference chord c',
      unit: 'm',
      details: 'Reynolds number and the pitching-moment coefficient are based on it.',
    }),
    span_m: geometry('span', 'm')
      .optional()
      .meta({ label: 'Span b', unit: 'm', help: '3D only', details: 'Required for a 3D model; a 2D model spans the tunnel width.' }),
    volume_m3: geometry('model volume', 'm³')
      .nullable()
      .default(null)
      .meta({
        label: 'Model volume',
        unit: 'm³',
        help: 'for solid blockage; empty skips it',
        details: 'Without it solid blockage is skipped, with a warning.',
      }),
    moment_ref_offset_m: z
      .strictObject({
        x: finite('metres toward the nose').meta({
          label: 'Moment reference ahead of balance centre, x',
          unit: 'm',
          details:
            'The moment reference centre relative to the balance moment centre, x toward the nose, z up: M_ref = M_bmc − N·x − A·z (body axes). For a 2D model put it at the quarter chord.',
        }),
        z: finite('metres up').meta({
          label: 'Moment reference above balance centre, z',
          unit: 'm',
          details: 'Up is the lift direction at zero angle of attack.',
        }),
      })
      .default({ x: 0, z: 0 }),
    loading: z
      .enum(['elliptic', 'uniform'], { error: 'expected "elliptic" or "uniform"' })
      .default('elliptic')
      .meta({ label: 'Span loading', help: 'for the computed lift-interference factor δ', form: false }),
    // ── model fields added by later work go below this line, one entry each ──
    // ---- tunnels and mountings (present in the read-back setup only when given) ----
    mounting: z.enum(['full', 'half'], { error: 'expected "full" or "half" (a half model on a reflection wall)' }).optional().meta({
      label: 'Mounting',
      defaultText: 'full',
      choices: { full: 'full model', half: 'half model on a reflection wall' },
      details: '`half`: a half model standing on the solid wall named by `reflection_wall`; `span_m` is then the semi-span and `area_m2`, `volume_m3` the half model\'s. Corrected as the full model mirrored across that wall (docs/methods.md §7a).',
    }),
    reflection_wall: z.enum(WALLS, { error: 'expected "floor", "ceiling", "left" or "right"' }).optional().meta({
      label: 'Reflection wall (half model)',
      help: 'a half model: span is the semi-span, area the half-model area',
      choices: { floor: 'floor', ceiling: 'ceiling', left: 'left wall', right: 'right wall' },
    }),
    moment_ref_xc: inRange('moment reference aft of the leading edge, in chords', -2, 3, '').optional().meta({
      label: 'Moment reference aft of the leading edge',
      unit: 'c',
      help: 'empty: 0.25 (quarter chord)',
      defaultText: '0.25',
      details: 'Chordwise position of the moment reference centre, in chords aft of the reference chord\'s leading edge; the streamline-curvature moment terms (2D and 3D) are referred to it.',
    }),
    fineness_ratio: inRange('length / diameter of the equivalent body of revolution', 1, 100, '').optional().meta({
      label: 'Body fineness ratio (length / diameter)',
      unit: '–',
      help: 'sets K = 1 + k1; empty: 6',
      defaultText: '6',
      details: 'Sets the default solid-blockage shape factor K = 1 + k1 of a prolate spheroid of this fineness (docs/methods.md §7).',
    }),
    tail_arm_m: geometry('tail arm, wing quarter chord to tail quarter chord', 'm').optional().meta({
      label: 'Tail arm (wing c/4 to tail c/4)',
      unit: 'm',
      help: 'tail-on models only',
    }),
    tail_cm_per_deg: finite('∂Cm/∂α at the tail, per degree').optional().meta({
      label: 'Pitching moment per degree of tail angle',
      unit: '1/deg',
      help: 'from runs at two tail incidences',
      details: 'With `tail_arm_m`, the tail-on moment correction ΔCm_t = −(∂Cm/∂α_t)·Δα_t is applied (docs/methods.md §7).',
    }),
    // ---- end tunnels and mountings ----
  })
  .superRefine((m, ctx) => {
    // the moment reference lies on or near the model: within SETUP_RANGES.moment_ref_offset_chords chords of the balance centre
    const limit = SETUP_RANGES.moment_ref_offset_chords * m.chord_m;
    for (const axis of ['x', 'z'] as const) {
      const v = m.moment_ref_offset_m[axis];
      if (Math.abs(v) > limit) {
        ctx.addIssue({
          code: 'custom',
          path: ['moment_ref_offset_m', axis],
          message: `expected within ±${limit.toPrecision(3)} m (${SETUP_RANGES.moment_ref_offset_chords} reference chords of ${m.chord_m} m)`,
        });
      }
    }
  })
  .meta({ group: 'Model' });

const tunnelSchema = z
  .strictObject({
    name: z.string().optional().meta({ label: 'Tunnel name', help: 'for people; not used by the reduction', form: false }),
    section: z.enum(SECTIONS, { error: `expected one of ${SECTIONS.map((x) => `"${x}"`).join(', ')}` }).meta({
      label: 'Test section',
      help: 'the shape and walls of the test section',
      choices: {
        'closed-rectangular': 'closed rectangular',
        'open-rectangular': 'open rectangular jet',
        rectangular: 'rectangular, each side chosen',
        'closed-circular': 'closed circular',
        'open-circular': 'open circular jet',
      },
      details: 'Rectangular sections take `width_m` and `height_m`, circular ones `diameter_m`; `rectangular` needs `boundaries`.',
    }),
    width_m: geometry('test-section width', 'm')
      .optional()
      .meta({ label: 'Test-section width B', unit: 'm', help: 'rectangular sections', details: 'Along the model span. Required for rectangular sections.' }),
    height_m: geometry('test-section height', 'm').optional().meta({ label: 'Test-section height H', unit: 'm', help: 'rectangular sections', details: 'Required for rectangular sections.' }),
    // ── tunnel fields added by later work go below this line, one entry each ──
    // ---- tunnels and mountings ----
    diameter_m: geometry('test-section diameter', 'm').optional().meta({ label: 'Diameter D', unit: 'm', help: 'circular sections', details: 'Required for circular sections.' }),
    fillet_m: finite('leg of the 45° corner fillets, m')
      .nonnegative({ error: 'expected 0 or a positive number (leg of the 45° corner fillets, m)' })
      .max(1e3, { error: 'expected 0 to 1000 m (leg of the 45° corner fillets)' })
      .optional()
      .meta({ label: 'Corner fillet leg f', unit: 'm', help: '45° fillets; C = B·H − 2f²', details: 'Rectangular sections; refused when a leg reaches half the shorter side.' }),
    boundaries: z
      .strictObject({ floor: boundary('floor'), ceiling: boundary('ceiling'), left: boundary('left'), right: boundary('right') })
      .optional()
      .meta({ details: 'Section `rectangular` only, and then required: each side `solid` or `free`.' }),
    // ---- end tunnels and mountings ----
  })
  .meta({ group: 'Tunnel' });

const balanceSchema = z
  .strictObject({
    axes: z.enum(['wind', 'body'], { error: 'expected "wind" (lift/drag columns) or "body" (normal/axial columns)' }).meta({
      label: 'Balance axes',
      choices: { wind: 'wind axes (lift, drag)', body: 'body axes (normal, axial)' },
    }),
    // ── balance fields added by later work go below this line, one entry each ──
    calibration: z
      .union([z.string().min(1), z.record(z.string(), z.unknown())], {
        error: 'expected the path of a balance file (relative to the setup file) or a balance document',
      })
      .optional()
      .meta({
        label: 'Balance calibration',
        help: 'raw bridge outputs: a balance file beside the setup, or the document inline',
        details:
          'The path of a balance file (relative to the setup file) or the same document inline (docs/data-format.md, "Balance file"). The run and its tare then hold bridge outputs; every sample is converted to loads before averaging.',
        form: false,
      }),
  })
  .meta({ group: 'Balance' });

const flowSchema = z
  .strictObject({
    gamma: inRange('ratio of specific heats', 1.0001, 2, '').default(1.4).meta({ label: 'Ratio of specific heats γ', unit: '–', form: false }),
    // ── flow fields added by later work go below this line, one entry each ──
    contraction_factor: positive('q per unit contraction pressure drop, from the facility calibration')
      .optional()
      .meta({
        label: 'Contraction factor',
        unit: '–',
        help: 'q = factor × dp_contraction; needed when the run logs the contraction pressure drop',
        details: 'The facility calibration of dynamic pressure against the settling-chamber to test-section pressure drop; required when `dp_contraction` is the pressure source.',
      }),
    upflow_deg: inRange('upflow angle, positive up', -10, 10, '°')
      .default(0)
      .meta({
        label: 'Upflow φ',
        unit: 'deg',
        help: 'flow angularity, positive up; measured by sweepbook upflow',
        details: 'Applied before the wall corrections: α += φ, and lift and drag are resolved to the flow, L = L′cos φ − D′sin φ, D = D′cos φ + L′sin φ.',
      }),
  })
  .prefault({})
  .meta({ group: 'Flow' });

const ambientSchema = z
  .strictObject({
    p_pa: inRange('static pressure, Pa', SETUP_RANGES.p_pa[0], SETUP_RANGES.p_pa[1], ' Pa').optional().meta({ label: 'Static pressure p', unit: 'Pa' }),
    t_c: inRange('°C', -100, 200, ' °C').optional().meta({ label: 'Stagnation temperature T₀', unit: '°C' }),
    rh_pct: inRange('%', 0, 100, ' %').optional().meta({ label: 'Relative humidity', unit: '%' }),
  })
  .prefault({})
  .meta({ group: 'Ambient (when the run has no column)', details: 'Used for a run file that lacks the `p_static`, `t_total` or `rh` column.' });

const correctionsSchema = z
  .strictObject({
    enabled: z
      .boolean({ error: 'expected true or false' })
      .default(true)
      .meta({ label: 'Apply wall corrections', details: "The command line's `--no-corrections` turns them off for one run." }),
    wake: z
      .enum(['classic', 'maskell'], { error: 'expected "classic" or "maskell"' })
      .default('classic')
      .meta({
        label: 'Wake blockage',
        details: "Maskell's separated-flow blockage applies to 3D models.",
        choices: { classic: 'classic', maskell: 'Maskell' },
      }),
    solid_blockage_k: z
      .number({ error: 'expected a number or null (solid-blockage shape factor)' })
      .finite()
      .min(SETUP_RANGES.solid_blockage_k[0], { error: `expected ${SETUP_RANGES.solid_blockage_k[0]} to ${SETUP_RANGES.solid_blockage_k[1]} (solid-blockage shape factor K)` })
      .max(SETUP_RANGES.solid_blockage_k[1], { error: `expected ${SETUP_RANGES.solid_blockage_k[0]} to ${SETUP_RANGES.solid_blockage_k[1]} (solid-blockage shape factor K)` })
      .nullable()
      .optional()
      .meta({
        label: 'Solid-blockage shape factor K',
        unit: '–',
        help: 'empty: 1 + k1 of the body (3D) or 0.74 (2D)',
        defaultText: '0.74 (2D); 3D: 1 + k1 of a prolate spheroid of model.fineness_ratio (1.045 for 6)',
        formKind: 'auto-number',
      }),
    delta: optionalFactor('lift-interference factor δ', SETUP_RANGES.delta).meta({
      label: 'Lift-interference factor δ',
      unit: '–',
      help: 'empty: computed for this tunnel and model',
      formKind: 'auto-number',
    }),
    tau1: optionalFactor('solid-blockage tunnel factor τ1', SETUP_RANGES.tau1).meta({
      label: 'Solid-blockage tunnel factor τ1',
      unit: '–',
      help: 'empty: computed',
      formKind: 'auto-number',
    }),
    tau2: optionalFactor('streamline-curvature factor τ2', SETUP_RANGES.tau2).meta({
      label: 'Streamline-curvature factor τ2',
      unit: '–',
      help: 'empty: computed',
      formKind: 'auto-number',
    }),
    // ── correction fields added by later work go below this line, one entry each ──
  })
  .prefault({})
  .meta({ group: 'Wall corrections', details: 'Methods and the factors computed when a factor is null: docs/methods.md §6 and §7.' });

const uncertaintySchema = z
  .strictObject({
    dp_pitot_pa: uncertainty('Pa', 1e4)
      .optional()
      .meta({ label: 'Pitot differential pressure', unit: 'Pa', help: 'all empty: no uncertainties, fits unweighted' }),
    p_static_pa: uncertainty('Pa', 1e5).optional().meta({ label: 'Static pressure', unit: 'Pa' }),
    t_total_c: uncertainty('K or °C difference', 50).optional().meta({ label: 'Stagnation temperature', unit: 'K' }),
    rh_pct: uncertainty('% RH', 100).optional().meta({ label: 'Relative humidity', unit: '% RH' }),
    force_n: uncertainty('N', 1e5).optional().meta({ label: 'Each balance force', unit: 'N' }),
    moment_nm: uncertainty('N m', 1e5).optional().meta({ label: 'Pitching moment', unit: 'N m' }),
    alpha_deg: uncertainty('deg', 10).optional().meta({ label: 'Angle of attack', unit: 'deg' }),
    area_rel: uncertainty('relative, e.g. 0.002', 0.5)
      .optional()
      .meta({ label: 'Reference area, relative', unit: '–', help: 'a fraction: 0.002 for 0.2 %' }),
    chord_rel: uncertainty('relative, e.g. 0.002', 0.5)
      .optional()
      .meta({ label: 'Reference chord, relative', unit: '–', help: 'a fraction: 0.002 for 0.2 %' }),
    // fits: the incidence zero, an offset common to every point of a run (systematic, not a weight)
    alpha_offset_deg: uncertainty('deg', 10).optional().meta({
      label: 'Angle-of-attack zero',
      unit: 'deg',
      help: 'offset common to every point',
      details: 'Standard uncertainty of the incidence zero. It is common to every point, so it does not weight the fits; it is propagated to the zero-lift angle and the other characteristics afterwards (docs/methods.md §8).',
    }),
  })
  .optional()
  .meta({
    group: 'Instrument uncertainties (standard, k = 1; optional)',
    details:
      'Standard uncertainties (k = 1) of the instruments. With the block every point carries `u_*` fields and the fits are weighted (docs/methods.md §9); an instrument uncertainty applies to the `ambient` value too when the column is absent.',
  });

export const setupSchema = z.strictObject({
  $schema: z.string().optional().meta({ label: 'JSON Schema', help: 'for editors: the path or address of setup.schema.json; ignored', form: false }),
  note: z.string().optional().meta({ label: 'Note', help: 'free text; not used by the reduction', form: false }),
  model: modelSchema,
  tunnel: tunnelSchema,
  balance: balanceSchema,
  flow: flowSchema,
  ambient: ambientSchema,
  corrections: correctionsSchema,
  uncertainty: uncertaintySchema,
  // ── blocks added by later work go below this line ──
  grouping: z
    .strictObject({
      alpha_tol_deg: positive('degrees')
        .max(5, { error: 'expected at most 5° (samples of one point stay within a fraction of a degree)' })
        .default(0.2)
        .meta({
          label: 'Grouping tolerance in α',
          unit: 'deg',
          help: 'rows without a point column within this of the group’s first row form one point',
          details: 'Consecutive rows whose α stays within this of the first row of the group (and whose wind state is the same) are samples of one point. Encoders jitter by about 0.1°; a sweep with finer steps sets it lower.',
        }),
    })
    .prefault({})
    .meta({ group: 'Grouping of samples' }),
  // fits: overrides of the automatic linear lift range (docs/methods.md §8)
  fit: z
    .strictObject({
      linear_tolerance_cl: positive('tolerance on lift residuals, in CL')
        .nullable()
        .default(null)
        .meta({
          label: 'Linear-range tolerance',
          unit: 'CL',
          help: 'empty: from the data’s own scatter',
          details: 'Largest residual of a lift-curve point from the straight line for it to count as linear. Empty (null): 3.5 times the scatter the data show, at least 0.01.',
        }),
      alpha_range_deg: z
        .tuple([finite('deg, low end'), finite('deg, high end')], { error: 'expected [low, high] in degrees, or null' })
        .refine(([lo, hi]) => lo < hi, { error: 'expected [low, high] with low < high' })
        .nullable()
        .default(null)
        .meta({
          label: 'Linear range in α',
          unit: 'deg',
          help: '[low, high]; empty: found from the data',
          details: 'Fit the lift line, the zero-lift angle and the drag polar over exactly the points with α in [low, high] (at least 5).',
          form: false,
        }),
    })
    .prefault({})
    .meta({ group: 'Fits' }),
});

/** The setup file as written (every field with a default may be left out). */
export type SetupInput = z.input<typeof setupSchema>;
type Parsed = z.output<typeof setupSchema>;
type Simplify<T> = { [K in keyof T]: T[K] } & {};

/**
 * The setup with defaults filled in; what the engine works from. Derived from the schema; only what
 * depends on other fields is stated here: a 2D model's area and span (chord × tunnel width, tunnel
 * width), the shape factor K by model kind, and `uncertainty` null when the block is absent.
 */
export type Setup = Simplify<
  Omit<Parsed, '$schema' | 'model' | 'tunnel' | 'corrections' | 'uncertainty' | 'balance'> & {
    /** `calibration`: checked (inline, or read by the host), a path still to read, or null (the run holds loads). */
    balance: Simplify<Omit<Parsed['balance'], 'calibration'> & { calibration: Balance | CalibrationPath | null }>;
    model: Simplify<Omit<Parsed['model'], 'area_m2' | 'span_m'> & { area_m2: number; span_m: number }>;
    /** width_m and height_m equal the diameter for a circular section, so every consumer finds a size. */
    tunnel: Simplify<Omit<Parsed['tunnel'], 'width_m' | 'height_m'> & { width_m: number; height_m: number }>;
    corrections: Simplify<Omit<Parsed['corrections'], 'solid_blockage_k'> & { solid_blockage_k: number }>;
    uncertainty: Parsed['uncertainty'] | null;
  }
>;

/** A balance calibration named by path, still to be read by the host (core reads no files). */
export interface CalibrationPath {
  path: string;
}

/**
 * Default solid-blockage shape factors: 2D Barlow, Rae & Pope 3rd ed. §9.2 (K1 = 0.74, wing spanning the
 * tunnel); 3D K = 1 + k1 of a prolate spheroid of fineness ratio 6 (Lamb's added mass, on the point-doublet
 * normalisation of the computed τ1; core/walls/shapeFactor.ts), or of `model.fineness_ratio` when given.
 */
export const DEFAULT_SOLID_BLOCKAGE_K = { '2d': 0.74, '3d': shapeFactorK(DEFAULT_FINENESS_RATIO) } as const;

export interface SetupResult {
  setup: Setup;
  warnings: Notice[];
}

/** Parse and validate setup JSON text. Throws InputError naming the file and the field. */
export function parseSetup(file: string, text: string): SetupResult {
  return validateSetup(file, parseJsonText(file, text));
}

/**
 * Parse a JSON document of ours (setup, column map, balance file), a byte-order mark allowed. Throws an
 * InputError naming the file and the line and column where the text stops being JSON: located by our
 * own scan, since V8 names no position for some errors ("Unexpected end of JSON input"; fuzz finding).
 */
export function parseJsonText(file: string, text: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return JSON.parse(body);
  } catch (err) {
    const { line, column } = jsonErrorPlace(body, err);
    throw new InputError({ file, line, column, message: `not valid JSON (${(err as Error).message})` });
  }
}

/** Validate an already-parsed setup object. Throws InputError naming the field. */
export function validateSetup(file: string, json: unknown): SetupResult {
  const parsed = setupSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new InputError({ file, field: fieldPath(issue.path) || '(top level)', message: describeIssue(issue, json) });
  }
  const { $schema: _editorHint, ...s } = parsed.data;
  const warnings: Notice[] = [];
  const m = s.model;
  let area: number;
  let span: number;
  const tunnel = checkTunnel(file, s, m.kind === '3d' ? m.span_m : undefined, warnings);
  if (m.kind === '2d') {
    area = m.chord_m * tunnel.width_m;
    span = tunnel.width_m;
    if (m.area_m2 !== undefined && Math.abs(m.area_m2 - area) > 1e-6 * area) {
      warnings.push({
        file,
        field: 'model.area_m2',
        message: `${m.area_m2} m² differs from chord × tunnel width = ${round(area)} m²; a 2D model's reference area is chord × width, so the given area is not used`,
      });
    }
  } else {
    if (m.area_m2 === undefined) throw new InputError({ file, field: 'model.area_m2', message: 'required for a 3d model (reference area, m²)' });
    if (m.span_m === undefined) throw new InputError({ file, field: 'model.span_m', message: 'required for a 3d model (span, m)' });
    area = m.area_m2;
    span = m.span_m;
  }
  return {
    warnings,
    setup: {
      ...s,
      model: { ...m, area_m2: area, span_m: span },
      tunnel,
      balance: { ...s.balance, calibration: setupCalibration(file, s.balance.axes, s.balance.calibration) },
      corrections: {
        ...s.corrections,
        solid_blockage_k:
          s.corrections.solid_blockage_k ?? (m.kind === '3d' && m.fineness_ratio !== undefined ? shapeFactorK(m.fineness_ratio) : DEFAULT_SOLID_BLOCKAGE_K[m.kind]),
      },
      uncertainty: s.uncertainty ?? null,
    },
  };
}

// ---- tunnels and mountings: checks ----
export { tunnelSectionOf, mountingOf } from '../walls/sections.ts';

/** The entries whose value is not undefined. */
function definedOnly<T extends Record<string, unknown>>(o: T): Partial<{ [K in keyof T]: Exclude<T[K], undefined> }> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<{ [K in keyof T]: Exclude<T[K], undefined> }>;
}

const article = (word: string) => (/^[aeiou]/.test(word) ? 'an' : 'a');

/** Size, boundaries, fillets and mounting checked together; refusals name the field, cautions become warnings. */
function checkTunnel(file: string, s: Omit<Parsed, '$schema'>, span: number | undefined, warnings: Notice[]): Setup['tunnel'] {
  const t = s.tunnel;
  const m = s.model;
  const refuse = (field: string, message: string): never => {
    throw new InputError({ file, field, message });
  };
  const circular = t.section === 'closed-circular' || t.section === 'open-circular';
  let width: number;
  let height: number;
  let diameter: number | null = null;
  if (circular) {
    if (t.diameter_m === undefined) refuse('tunnel.diameter_m', `required for ${article(t.section)} ${t.section} section (diameter, m)`);
    diameter = t.diameter_m!;
    for (const k of ['width_m', 'height_m'] as const) {
      if (t[k] !== undefined && t[k] !== diameter) refuse(`tunnel.${k}`, `a circular section is sized by tunnel.diameter_m (${diameter} m); ${t[k]} m here disagrees — remove it`);
    }
    if (t.fillet_m) refuse('tunnel.fillet_m', 'corner fillets apply to rectangular sections only');
    width = height = diameter;
  } else {
    if (t.width_m === undefined) refuse('tunnel.width_m', `required for ${article(t.section)} ${t.section} section (width along the span, m)`);
    if (t.height_m === undefined) refuse('tunnel.height_m', `required for ${article(t.section)} ${t.section} section (height, m)`);
    if (t.diameter_m !== undefined) refuse('tunnel.diameter_m', `only for circular sections; a ${t.section} section is sized by width_m and height_m`);
    width = t.width_m!;
    height = t.height_m!;
  }
  let boundaries: Boundaries;
  if (t.section === 'rectangular') {
    if (!t.boundaries) refuse('tunnel.boundaries', 'required for section "rectangular": { "floor", "ceiling", "left", "right" }, each "solid" or "free"');
    boundaries = t.boundaries!;
  } else {
    if (t.boundaries) refuse('tunnel.boundaries', `only for section "rectangular"; "${t.section}" fixes every boundary (use "rectangular" to set each side)`);
    const kind = t.section.startsWith('open') ? 'free' : 'solid';
    boundaries = { floor: kind, ceiling: kind, left: kind, right: kind };
  }
  if (m.mounting !== 'half' && m.reflection_wall !== undefined) refuse('model.reflection_wall', 'applies to a half model only (set model.mounting to "half")');
  if (m.mounting === 'half' && m.reflection_wall === undefined) refuse('model.reflection_wall', 'required for a half model: the wall it stands on, "floor", "ceiling", "left" or "right"');
  if (m.tail_cm_per_deg !== undefined && m.tail_arm_m === undefined) warnings.push({ file, field: 'model.tail_cm_per_deg', message: 'given without model.tail_arm_m: no tail-on correction is made' });
  const out: Setup['tunnel'] = {
    ...(t.name !== undefined ? { name: t.name } : {}),
    section: t.section,
    width_m: width,
    height_m: height,
    ...definedOnly({ diameter_m: diameter ?? undefined, boundaries: t.section === 'rectangular' ? boundaries : undefined, fillet_m: t.fillet_m }),
  };
  const section = tunnelSectionOf(out);
  const mounting: Mounting = m.mounting === 'half' ? { kind: 'half', wall: m.reflection_wall! } : { kind: 'full' };
  if (m.kind === '2d' && t.section === 'open-rectangular') {
    refuse('tunnel.section', 'a 2d model spans the width between solid side walls; for free floor and ceiling between solid sides use section "rectangular" with boundaries');
  }
  const { errors, cautions } = checkMounting(section, mounting, m.kind, span);
  if (errors.length > 0) refuse(errors[0]!.field, errors[0]!.message);
  for (const c of cautions) warnings.push({ file, field: c.field, message: c.message });
  return out;
}
// ---- end tunnels and mountings ----

/** The setup's calibration: an inline document checked here, a path kept for the host to read. */
function setupCalibration(file: string, axes: 'wind' | 'body', c: string | Record<string, unknown> | undefined): Balance | CalibrationPath | null {
  if (c === undefined) return null;
  if (typeof c === 'string') return { path: c };
  const b = validateBalance(file, c, 'balance.calibration.');
  checkBalanceAxes(b, axes);
  return b;
}

function round(x: number): string {
  return Number(x.toPrecision(6)).toString();
}

function fieldPath(path: ReadonlyArray<PropertyKey>): string {
  return path.map((p) => (typeof p === 'number' ? `[${p}]` : String(p))).join('.').replace(/\.\[/g, '[');
}

/** Known keys at a setup path, for "did you mean" suggestions. */
function knownKeys(path: ReadonlyArray<PropertyKey>): string[] {
  let schema: z.ZodType = setupSchema;
  for (const p of path) {
    const inner = unwrap(schema);
    if (!(inner instanceof z.ZodObject)) return [];
    const next = (inner.shape as Record<string, z.ZodType>)[String(p)];
    if (!next) return [];
    schema = next;
  }
  const inner = unwrap(schema);
  return inner instanceof z.ZodObject ? Object.keys(inner.shape) : [];
}

function unwrap(schema: z.ZodType): z.ZodType {
  let s: z.ZodType = schema;
  while (s instanceof z.ZodOptional || s instanceof z.ZodNullable || s instanceof z.ZodDefault || s instanceof z.ZodPrefault) s = s.unwrap() as z.ZodType;
  return s;
}

function describeIssue(issue: z.core.$ZodIssue, json: unknown): string {
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0]!;
    const near = nearest(key, knownKeys(issue.path));
    const where = fieldPath([...issue.path, key]);
    return `unknown key "${where}"${near ? `; did you mean "${near}"?` : ''}`;
  }
  // zod 4 leaves `issue.input` out of its issues, so every wrong-typed value was called "missing"
  // (fuzz finding: "chord_m": "0.2" read as missing); look the value up in the parsed JSON instead
  if (issue.code === 'invalid_type') {
    const found = valueAt(json, issue.path);
    // a block (model, tunnel, ...) has no message of its own; zod's default reads "Invalid input: expected object, received null"
    const expected = issue.expected === 'object' ? 'expected an object of fields, { ... }' : issue.message;
    return found.present ? `${expected}, not ${describeValue(found.value)}` : `missing; ${expected}`;
  }
  return issue.message;
}

/** The value at a path of the parsed JSON, if there is one (own properties only). */
function valueAt(json: unknown, path: ReadonlyArray<PropertyKey>): { present: boolean; value?: unknown } {
  let v = json;
  for (const p of path) {
    if (v === null || typeof v !== 'object' || !Object.prototype.hasOwnProperty.call(v, p)) return { present: false };
    v = (v as Record<PropertyKey, unknown>)[p];
  }
  return { present: v !== undefined, value: v };
}

/** A short description of a JSON value for a message: `the text "0.2"`, `null`, `a list`. */
function describeValue(v: unknown): string {
  if (typeof v === 'string') return `the text ${JSON.stringify(v.length > 24 ? `${v.slice(0, 24)}…` : v)}`;
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'an object';
  return String(v);
}

/** The known key closest to `key` by edit distance, if it is close enough to be a likely typo. */
export function nearest(key: string, known: string[]): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const k of known) {
    const d = editDistance(key.toLowerCase(), k.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  return best !== undefined && bestD <= Math.max(2, Math.floor(key.length / 2)) ? best : undefined;
}

/** Levenshtein distance between two strings (insertions, deletions, substitutions; common practice). */
export function editDistance(a: string, b: string): number {
  const prev = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!;
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = prev[j]!;
      prev[j] = Math.min(prev[j]! + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = tmp;
    }
  }
  return prev[b.length]!;
}

/** Line and column (1-based) of a JSON syntax error: where {@link jsonErrorOffset} stops, else V8's "at position N". */
function jsonErrorPlace(text: string, err: unknown): { line: number; column: number } {
  let pos = jsonErrorOffset(text);
  if (pos === undefined) {
    const m = /position (\d+)/.exec(String((err as Error)?.message));
    pos = m ? Math.min(Number(m[1]), text.length) : 0;
  }
  const before = text.slice(0, pos);
  const line = before.split('\n').length;
  const column = pos - before.lastIndexOf('\n');
  return { line, column };
}

/**
 * Offset of the first character at which `text` stops being JSON (RFC 8259 grammar), or undefined when
 * it is valid. A loop with an explicit stack, so deeply nested junk cannot overflow the call stack.
 */
export function jsonErrorOffset(text: string): number | undefined {
  const n = text.length;
  let i = 0;
  const stack: number[] = []; // 123 "{" or 91 "["
  const ws = () => {
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c !== 32 && c !== 9 && c !== 10 && c !== 13) break;
      i++;
    }
  };
  const digits = () => {
    const from = i;
    while (i < n && text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) i++;
    return i > from;
  };
  /** Scan a string starting at its opening quote; false leaves i at the offending character. */
  const string = (): boolean => {
    i++;
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c === 34) {
        i++;
        return true;
      }
      if (c < 32) return false;
      if (c === 92) {
        const e = text[i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) return (i += 2), false;
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else return (i += 1), false;
      } else i++;
    }
    return false;
  };
  const number = (): boolean => {
    if (text[i] === '-') i++;
    if (text[i] === '0') i++;
    else if (!digits()) return false;
    if (text[i] === '.') {
      i++;
      if (!digits()) return false;
    }
    if (text[i] === 'e' || text[i] === 'E') {
      i++;
      if (text[i] === '+' || text[i] === '-') i++;
      if (!digits()) return false;
    }
    return true;
  };
  let state: 'value' | 'key' | 'after' = 'value';
  for (;;) {
    ws();
    if (state === 'value') {
      const c = text[i];
      if (c === '{' || c === '[') {
        stack.push(c.charCodeAt(0));
        i++;
        ws();
        if (text[i] === (c === '{' ? '}' : ']')) {
          stack.pop();
          i++;
          state = 'after';
        } else state = c === '{' ? 'key' : 'value';
      } else if (c === '"') {
        if (!string()) return i;
        state = 'after';
      } else if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) {
        if (!number()) return i;
        state = 'after';
      } else {
        const word = ['true', 'false', 'null'].find((w) => w[0] === c);
        if (!word) return i;
        for (let k = 0; k < word.length; k++, i++) if (text[i] !== word[k]) return i;
        state = 'after';
      }
    } else if (state === 'key') {
      if (text[i] !== '"' || !string()) return i;
      ws();
      if (text[i] !== ':') return i;
      i++;
      state = 'value';
    } else {
      const top = stack[stack.length - 1];
      if (top === undefined) return i < n ? i : undefined;
      const c = text[i];
      if (c === ',') {
        i++;
        state = top === 123 ? 'key' : 'value';
        if (top === 123) ws();
      } else if (c === (top === 123 ? '}' : ']')) {
        stack.pop();
        i++;
      } else return i;
    }
  }
}
