/**
 * The plate spec: the one JSON document that describes an adapter plate. Stored with every
 * revision, edited by the plate editor, read by the CAD build and the exports. One zod schema
 * serves them all (`type PlateSpec = z.infer<typeof plateSpecSchema>`). It is written with
 * `zod/mini` (the same checks as classic zod, in functions a bundler can leave out when unused),
 * because the plate editor ships it to the browser; server code may compose it in classic schemas.
 *
 * Every object is strict: an unknown field is rejected with its path (e.g.
 * `engineFace.holes.3.colour`), so a typo never silently drops a value.
 *
 * Lengths are millimetres, angles degrees. Coordinates of each face are given as that face was
 * measured (`viewedFrom`); `plateProfile` turns them into plate coordinates (see
 * `profileTypes.ts` for the one plate-coordinate convention).
 *
 * Feature ids are the builder's: unique over the whole plate, the same in the hole table, the
 * drawing, the DXF, the CSV and the inspection. Suggested: engine holes `E1…`, engine dowels
 * `ED1…`, transmission holes `T1…`, transmission dowels `TD1…`, starter mounting holes `SM1…`.
 * Reserved for features the plate makes itself: `C1` (centre bore), `S1` (starter nose bore),
 * `P1` (starter pocket).
 */
import { z } from 'zod/mini';
import { DomainError } from './errors';
import { HOLE_FLAGS } from './measure/holeQuality';
import { stackUpInputsSchema } from './stackUp';
import { capScrewHead } from './standards/capScrews';
import { CLEARANCE_CLASSES, clearanceRangeMm, type ClearanceClass } from './standards/clearanceHoles';
import { isoTolerance } from './standards/isoFits';
import { tapDrillMm } from './standards/tapDrills';
import { parseFastener } from './standards/threads';

/** Feature ids the plate gives its own features. */
export const RESERVED_FEATURE_IDS = Object.freeze({ centreBore: 'C1', starterBore: 'S1', starterPocket: 'P1' });

// zod/mini loads no message language of its own: messages the spec does not word itself ("Too
// small: …") are zod's English ones, as on the server, unless the app has chosen a language.
if (!z.core.globalConfig.localeError) z.config(z.locales.en());

/** An error message for a type-level check: "is required" when the field is missing. */
function need(message: string): { error: (issue: { input?: unknown }) => string } {
  return { error: (issue) => (issue.input === undefined ? 'is required' : message) };
}

const ID_RE = /^[A-Za-z][A-Za-z0-9_-]{0,15}$/;

const featureIdSchema = z
  .string(need('must be a feature id (text)'))
  .check(z.regex(ID_RE, { error: 'must start with a letter and hold up to 16 letters, digits, "-" or "_" (e.g. "E1", "TD2")' }));

/** No length of an adapter plate comes near this; beyond it areas and masses lose all meaning (and overflow). */
export const MAX_LENGTH_MM = 10_000;
const mm = z
  .number(need('must be a number of millimetres'))
  .check(
    z.minimum(-MAX_LENGTH_MM, { error: `must be within ±${MAX_LENGTH_MM} mm (10 m)` }),
    z.maximum(MAX_LENGTH_MM, { error: `must be within ±${MAX_LENGTH_MM} mm (10 m)` }),
  );
const positiveMm = mm.check(z.positive({ error: 'must be greater than 0 mm' }));
const nonNegativeMm = mm.check(z.minimum(0, { error: 'must be 0 mm or more' }));
const deg = z.number(need('must be a number of degrees'));
const sideSchema = z.enum(['engine', 'transmission'], need('must be "engine" or "transmission"'));
const noteSchema = z.string().check(z.maxLength(500, { error: 'must be at most 500 characters' }));

/** Calls a standards lookup inside a refinement; its DomainError message becomes the issue. */
function lookupIssue(ctx: z.core.$RefinementCtx, path: (string | number)[], fn: () => unknown): boolean {
  try {
    fn();
    return true;
  } catch (e) {
    if (e instanceof DomainError) {
      ctx.addIssue({ code: 'custom', message: e.message, path });
      return false;
    }
    throw e;
  }
}

const point2Schema = z.strictObject({ x: mm, y: mm });

// ---------------------------------------------------------------------------------------------
// Patterns and holes
// ---------------------------------------------------------------------------------------------

/**
 * A bolt circle: `count` holes evenly spaced from `startAngleDeg`, or explicit `anglesDeg`.
 * Angles counter-clockwise from +X in the face's own coordinates (as measured, see `viewedFrom`).
 * `centerX/centerY` place the circle's centre (default on the face's shaft axis).
 * `fitted` records a fit from measurements: the fitted circle's centre relative to the face's
 * shaft axis (crank axis for the engine, input-shaft axis for the transmission). The face's shaft
 * axis then lands on the plate at (centerX − fitted.centerX, centerY − fitted.centerY); the
 * checks compare that with the common axis.
 */
export const boltPatternSchema = z
  .strictObject({
    id: featureIdSchema,
    diameterMm: positiveMm,
    count: z.optional(z.int(need('must be a whole number of holes')).check(z.minimum(1), z.maximum(360))),
    startAngleDeg: z.optional(deg),
    anglesDeg: z.optional(z.array(deg).check(z.minLength(1, { error: 'must list at least one angle' }), z.maxLength(360))),
    centerX: z._default(mm, 0),
    centerY: z._default(mm, 0),
    fitted: z.optional(
      z.strictObject({
        centerX: mm,
        centerY: mm,
        rmsMm: nonNegativeMm,
        fromUploadId: z.optional(z.string().check(z.minLength(1), z.maxLength(64))),
        /** RMS of the holes' angular positions about the pattern's best angles */
        angularRmsDeg: z.optional(z.number(need('must be a number of degrees')).check(z.minimum(0))),
        /** measured holes the circle was fitted through */
        holeCount: z.optional(z.int(need('must be a whole number of holes')).check(z.minimum(1), z.maximum(360))),
        /** when a bore was fitted: the bolt circle centre's distance from the bore axis, TIR = 2 × offset */
        bore: z.optional(
          z.strictObject({
            offsetMm: nonNegativeMm,
            tirMm: nonNegativeMm,
            diameterMm: z.optional(positiveMm),
            cylindricityMm: z.optional(nonNegativeMm),
            tiltDeg: z.optional(z.number(need('must be a number of degrees')).check(z.minimum(0), z.maximum(90))),
          }),
        ),
      }),
    ),
    note: z.optional(noteSchema),
  })
  .check(z.superRefine((p, ctx) => {
    if ((p.count === undefined) === (p.anglesDeg === undefined)) {
      ctx.addIssue({ code: 'custom', message: 'give either count (with startAngleDeg) or anglesDeg, not both or neither', path: ['count'] });
    }
    if (p.anglesDeg !== undefined && p.startAngleDeg !== undefined) {
      ctx.addIssue({ code: 'custom', message: 'startAngleDeg goes with count; with anglesDeg give every angle', path: ['startAngleDeg'] });
    }
  }));

/** Counterbore for a bolt head. Diameter and depth default to the cap screw's (ISO 4762 / ASME B18.3). */
export const counterboreSchema = z.strictObject({
  /** side it is cut from; default: the side the bolt heads sit on */
  side: z.optional(sideSchema),
  diameterMm: z.optional(positiveMm),
  depthMm: z.optional(positiveMm),
});

export const dowelSchema = z.strictObject({
  diameterMm: positiveMm,
  /** ISO 286 hole tolerance class of the reamed hole */
  fit: z._default(z.string().check(z.trim(), z.minLength(1)), 'H7'),
});

const clearanceClassSchema = z.enum(CLEARANCE_CLASSES as [ClearanceClass, ...ClearanceClass[]], need('must be one of fine, medium, coarse (ISO 273) or close, normal, loose (ASME B18.2.8)'));

/** Fields every hole shares, wherever it is placed. */
const holeFields = {
  id: featureIdSchema,
  /** clearance: a bolt passes; tapped: the plate is threaded; dowel: reamed for a dowel pin; stud: a flange stud passes */
  role: z.enum(['clearance', 'tapped', 'dowel', 'stud'], need('must be "clearance", "tapped", "dowel" or "stud"')),
  /** e.g. "M10x1.5", "M10", "3/8-16 UNC", "3/8" */
  fastener: z.optional(z.string().check(z.trim(), z.minLength(1, { error: 'must name a fastener, e.g. "M10x1.5" or "3/8-16 UNC"' }))),
  /** clearance holes; default medium (metric) / normal (inch) */
  clearanceClass: z.optional(clearanceClassSchema),
  /** explicit hole diameter (clearance or tap drill), overrides the table */
  diameterMm: z.optional(positiveMm),
  counterbore: z.optional(counterboreSchema),
  /** tapped holes: usable thread length; default the full hole depth */
  threadDepthMm: z.optional(positiveMm),
  dowel: z.optional(dowelSchema),
  /** blind hole depth from the face's own side; omitted = through */
  depthMm: z.optional(positiveMm),
  note: z.optional(noteSchema),
} as const;

type HoleFields = {
  role: 'clearance' | 'tapped' | 'dowel' | 'stud';
  fastener?: string;
  clearanceClass?: ClearanceClass;
  diameterMm?: number;
  counterbore?: { side?: 'engine' | 'transmission'; diameterMm?: number; depthMm?: number };
  threadDepthMm?: number;
  dowel?: { diameterMm: number; fit: string };
  depthMm?: number;
};

/** Role-dependent rules of a hole, with each issue on the field that breaks it. */
function refineHoleRole(h: HoleFields, ctx: z.core.$RefinementCtx): void {
  const forbid = (field: keyof HoleFields, why: string) => {
    if (h[field] !== undefined) ctx.addIssue({ code: 'custom', message: why, path: [field] });
  };
  if (h.role === 'dowel') {
    if (h.dowel === undefined) {
      ctx.addIssue({ code: 'custom', message: 'a dowel hole needs dowel: { diameterMm, fit }', path: ['dowel'] });
    } else {
      lookupIssue(ctx, ['dowel', 'fit'], () => isoTolerance(h.dowel!.diameterMm, h.dowel!.fit));
    }
    forbid('fastener', 'a dowel hole takes no fastener (give dowel.diameterMm)');
    forbid('clearanceClass', 'only clearance and stud holes have a clearance class');
    forbid('counterbore', 'only clearance holes are counterbored');
    forbid('threadDepthMm', 'only tapped holes have a thread depth');
    forbid('diameterMm', 'a dowel hole is sized by dowel.diameterMm');
    return;
  }
  forbid('dowel', `a ${h.role} hole has no dowel; use role "dowel"`);
  if (h.fastener === undefined) {
    ctx.addIssue({ code: 'custom', message: `a ${h.role} hole needs a fastener, e.g. "M10x1.5" or "3/8-16 UNC"`, path: ['fastener'] });
    return;
  }
  if (!lookupIssue(ctx, ['fastener'], () => parseFastener(h.fastener!))) return;
  if (h.role === 'tapped') {
    forbid('clearanceClass', 'only clearance and stud holes have a clearance class');
    forbid('counterbore', 'a tapped hole is not counterbored');
    if (h.diameterMm === undefined) lookupIssue(ctx, ['fastener'], () => tapDrillMm(h.fastener!));
    if (h.depthMm !== undefined && h.threadDepthMm !== undefined && h.threadDepthMm > h.depthMm + 1e-9) {
      ctx.addIssue({
        code: 'custom',
        message: `threadDepthMm ${h.threadDepthMm} mm is deeper than the hole (depthMm ${h.depthMm} mm)`,
        path: ['threadDepthMm'],
      });
    }
    return;
  }
  // clearance or stud
  forbid('threadDepthMm', 'only tapped holes have a thread depth');
  forbid('depthMm', `a ${h.role} hole goes through the plate; only tapped and dowel holes can be blind`);
  if (h.diameterMm === undefined) lookupIssue(ctx, ['fastener'], () => clearanceRangeMm(h.fastener!));
  const cb = h.counterbore;
  if (cb !== undefined && (cb.diameterMm === undefined || cb.depthMm === undefined)) {
    lookupIssue(ctx, ['counterbore'], () => capScrewHead(h.fastener!));
  }
}

/**
 * Where a measured hole's numbers came from: its circle fit on the scanned face (centre in the
 * upload's face coordinates u, v), the fit's quality figures and flags, the nearest standard size
 * (measured − standard) and the upload. Written when a measured pattern is applied; the hole's
 * place and size are still its other fields.
 */
export const measuredHoleSchema = z.strictObject({
  fromUploadId: z.string(need('must be the id of the upload (text)')).check(z.minLength(1), z.maxLength(64)),
  centerU: mm,
  centerV: mm,
  diameterMm: positiveMm,
  rmsMm: nonNegativeMm,
  roundnessMm: nonNegativeMm,
  points: z.int(need('must be a whole number of points')).check(z.minimum(0)),
  arcCoverageDeg: deg.check(z.minimum(0), z.maximum(360)),
  flags: z
    .array(z.enum(HOLE_FLAGS, need(`must be one of ${HOLE_FLAGS.join(', ')}`)), need('must be a list of flags (may be empty)'))
    .check(z.maxLength(HOLE_FLAGS.length)),
  nearest: z.optional(z.strictObject({ label: z.string().check(z.minLength(1), z.maxLength(80)), differenceMm: mm })),
  /** the hole's distance off the fitted bolt circle (+ outside) and its angle off the pattern's slot */
  radialDeviationMm: z.optional(mm),
  angleDeviationDeg: z.optional(deg),
});

/**
 * A hole of one flange pattern: at `x, y` (face coordinates, as measured) or at slot `index`
 * (0-based) of bolt circle `patternId` of the same face.
 */
export const holeSchema = z
  .strictObject({
    ...holeFields,
    fitted: z.optional(measuredHoleSchema),
    x: z.optional(mm),
    y: z.optional(mm),
    patternId: z.optional(featureIdSchema),
    index: z.optional(z.int(need('must be a whole number (0 = the first hole of the pattern)')).check(z.minimum(0))),
  })
  .check(z.superRefine((h, ctx) => {
    const byXY = h.x !== undefined || h.y !== undefined;
    const byPattern = h.patternId !== undefined || h.index !== undefined;
    if (byXY && byPattern) {
      ctx.addIssue({ code: 'custom', message: 'place a hole either by x, y or by patternId + index, not both', path: ['patternId'] });
    } else if (byXY && (h.x === undefined || h.y === undefined)) {
      ctx.addIssue({ code: 'custom', message: 'a hole placed by coordinates needs both x and y', path: [h.x === undefined ? 'x' : 'y'] });
    } else if (byPattern && (h.patternId === undefined || h.index === undefined)) {
      ctx.addIssue({
        code: 'custom',
        message: 'a hole placed on a pattern needs both patternId and index',
        path: [h.patternId === undefined ? 'patternId' : 'index'],
      });
    } else if (!byXY && !byPattern) {
      ctx.addIssue({ code: 'custom', message: 'a hole needs a place: x and y, or patternId and index', path: ['x'] });
    }
    refineHoleRole(h, ctx);
  }));

/**
 * The contact region of a flange on the plate, used to find bolt heads that would sit under it.
 * `hull`: the hull of the face's holes grown by `marginMm` (default). `polygon`: an explicit
 * outline in the face's coordinates (as measured, mirrored like its holes).
 */
export const flangeFootprintSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('hull'), marginMm: z._default(nonNegativeMm, 10) }),
    z.strictObject({ kind: z.literal('polygon'), points: z.array(point2Schema).check(z.minLength(3, { error: 'needs at least 3 points' })) }),
  ],
  need('kind must be "hull" or "polygon"'),
);

/** One flange (engine rear face or transmission bell-housing face) as measured. */
export const faceSchema = z
  .strictObject({
    /**
     * How the coordinates were taken: `rear` = already in plate coordinates (looking forward,
     * e.g. at the engine's rear face); `front` = looking rearward at the face (e.g. at the bell
     * housing's mating face) — mirrored x → −x onto the plate.
     */
    viewedFrom: z.enum(['rear', 'front'], need('must be "rear" (plate coordinates) or "front" (mirrored onto the plate)')),
    description: z.optional(z.string().check(z.maxLength(200))),
    patterns: z._default(z.array(boltPatternSchema), []),
    holes: z._default(z.array(holeSchema), []),
    /**
     * Side of the plate the bolt heads of this face's clearance holes sit on. Default: the other
     * side (an engine-face bolt comes from the transmission side and threads into the block).
     * The face's own side means the bolt comes through the flange and a nut sits on the other side.
     */
    boltHeadSide: z.optional(sideSchema),
    flangeFootprint: z.prefault(flangeFootprintSchema, { kind: 'hull' }),
  })
  .check(z.superRefine((f, ctx) => {
    const patterns = new Map<string, number>();
    f.patterns.forEach((p, i) => {
      if (patterns.has(p.id)) {
        ctx.addIssue({ code: 'custom', message: `pattern id "${p.id}" is used twice on this face`, path: ['patterns', i, 'id'] });
      }
      patterns.set(p.id, p.count ?? p.anglesDeg?.length ?? 0);
    });
    const taken = new Map<string, number>();
    f.holes.forEach((h, i) => {
      if (h.patternId === undefined || h.index === undefined) return;
      const size = patterns.get(h.patternId);
      if (size === undefined) {
        const known = [...patterns.keys()].map((k) => `"${k}"`).join(', ') || 'none';
        ctx.addIssue({ code: 'custom', message: `no pattern "${h.patternId}" on this face (patterns: ${known})`, path: ['holes', i, 'patternId'] });
        return;
      }
      if (h.index >= size) {
        ctx.addIssue({
          code: 'custom',
          message: `pattern "${h.patternId}" has ${size} holes, so index runs 0 to ${size - 1}; got ${h.index}`,
          path: ['holes', i, 'index'],
        });
        return;
      }
      const slot = `${h.patternId}#${h.index}`;
      const first = taken.get(slot);
      if (first !== undefined) {
        ctx.addIssue({
          code: 'custom',
          message: `slot ${h.index} of pattern "${h.patternId}" is already taken by holes.${first}`,
          path: ['holes', i, 'index'],
        });
      } else taken.set(slot, i);
    });
  }));

// ---------------------------------------------------------------------------------------------
// Centre bore, starter
// ---------------------------------------------------------------------------------------------

const limitsSchema = z
  .strictObject({ lowerMm: positiveMm, upperMm: positiveMm })
  .check(z.refine((l) => l.upperMm >= l.lowerMm, { error: 'upperMm must not be below lowerMm', path: ['upperMm'] }));

/**
 * The centre bore: `bore` = clearance for the crank flange / rear seal; `register` = a locating
 * bore that a spigot fits into (give its fit or its size limits).
 */
export const centreBoreSchema = z
  .strictObject({
    kind: z.enum(['bore', 'register'], need('must be "bore" or "register"')),
    diameterMm: positiveMm,
    /** ISO 286 hole class, e.g. "H7" */
    fit: z.optional(z.string().check(z.trim(), z.minLength(1))),
    /** explicit size limits (e.g. from a housing standard), instead of an ISO class */
    limitsMm: z.optional(limitsSchema),
    note: z.optional(noteSchema),
  })
  .check(z.superRefine((c, ctx) => {
    if (c.fit !== undefined && c.limitsMm !== undefined) {
      ctx.addIssue({ code: 'custom', message: 'give fit or limitsMm, not both', path: ['limitsMm'] });
    }
    if (c.kind === 'register' && c.fit === undefined && c.limitsMm === undefined) {
      ctx.addIssue({ code: 'custom', message: 'a register locates: give its fit (e.g. "H7") or limitsMm', path: ['fit'] });
    }
    if (c.fit !== undefined) lookupIssue(ctx, ['fit'], () => isoTolerance(c.diameterMm, c.fit!));
  }));

/** A starter mounting hole, placed relative to the nose bore centre along the starter's radial line. */
export const starterHoleSchema = z
  .strictObject({
    id: featureIdSchema,
    role: z.enum(['clearance', 'tapped'], need('must be "clearance" or "tapped"')),
    fastener: holeFields.fastener,
    clearanceClass: holeFields.clearanceClass,
    diameterMm: holeFields.diameterMm,
    counterbore: holeFields.counterbore,
    threadDepthMm: holeFields.threadDepthMm,
    depthMm: holeFields.depthMm,
    /** outward from the crank axis through the nose bore centre */
    radialMm: mm,
    /** 90° counter-clockwise from the radial direction */
    tangentialMm: mm,
    note: holeFields.note,
  })
  .check(z.superRefine((h, ctx) => refineHoleRole(h, ctx)));

/** Starter recess (pocket) around the nose bore: a circle, or a slot whose long axis is tangential. */
export const starterRecessSchema = z.strictObject({
  depthMm: positiveMm,
  /** default: the side the starter sits on */
  side: z.optional(sideSchema),
  shape: z.discriminatedUnion(
    'kind',
    [
      z.strictObject({ kind: z.literal('circle'), diameterMm: positiveMm }),
      z
        .strictObject({ kind: z.literal('slot'), widthMm: positiveMm, lengthMm: positiveMm })
        .check(z.refine((s) => s.lengthMm >= s.widthMm, { error: 'lengthMm must be at least widthMm', path: ['lengthMm'] })),
    ],
    need('kind must be "circle" or "slot"'),
  ),
});

export const starterSchema = z
  .strictObject({
    /** side of the plate the starter body sits on */
    side: z._default(sideSchema, 'engine'),
    ringGear: z
      .strictObject({
        teeth: z.int(need('must be a whole number of teeth')).check(z.minimum(20), z.maximum(400)),
        moduleMm: z.optional(positiveMm),
        diametralPitch: z.optional(z.number().check(z.positive({ error: 'must be greater than 0 (teeth per inch of pitch diameter)' }))),
      })
      .check(z.superRefine((g, ctx) => {
        if ((g.moduleMm === undefined) === (g.diametralPitch === undefined)) {
          ctx.addIssue({ code: 'custom', message: 'give either moduleMm (metric) or diametralPitch (inch), not both or neither', path: ['moduleMm'] });
        }
      })),
    pinion: z.strictObject({ teeth: z.int(need('must be a whole number of teeth')).check(z.minimum(5), z.maximum(40)) }),
    /** position of the nose bore around the crank axis, plate coordinates, CCW from +X */
    angleDeg: deg,
    /** where the nose bore centre is actually put from the axis; default: the gear centre distance */
    centreDistanceMm: z.optional(positiveMm),
    noseBoreDiameterMm: positiveMm,
    /** ISO 286 hole class of the nose bore, e.g. "H8" */
    noseFit: z.optional(z.string().check(z.trim(), z.minLength(1))),
    mountingHoles: z._default(z.array(starterHoleSchema), []),
    recess: z.optional(starterRecessSchema),
  })
  .check(z.superRefine((s, ctx) => {
    if (s.noseFit !== undefined) lookupIssue(ctx, ['noseFit'], () => isoTolerance(s.noseBoreDiameterMm, s.noseFit!));
  }));

// ---------------------------------------------------------------------------------------------
// Outline, material, tolerances, the whole plate
// ---------------------------------------------------------------------------------------------

export const outlineSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('auto'),
      /** material kept around every feature */
      edgeMarginMm: z._default(nonNegativeMm, 12),
      /** smallest corner radius of the plate */
      cornerRadiusMm: z._default(nonNegativeMm, 10),
    }),
    z.strictObject({
      kind: z.literal('polygon'),
      /** corners in plate coordinates (either direction) */
      points: z.array(point2Schema).check(z.minLength(3, { error: 'needs at least 3 corners' })),
      cornerRadiusMm: z._default(nonNegativeMm, 0),
      /** radius of each corner in the order of `points` (0 = sharp); a missing one takes cornerRadiusMm */
      cornerRadiiMm: z.optional(z.array(z.nullable(nonNegativeMm))),
    }),
  ],
  need('kind must be "auto" or "polygon"'),
);

export const materialSchema = z.strictObject({
  name: z.string().check(z.trim(), z.minLength(1), z.maxLength(60)),
  densityGPerCm3: z.number().check(z.positive({ error: 'must be greater than 0 g/cm³' }), z.maximum(25)),
  yieldMpa: z.optional(z.number().check(z.positive({ error: 'must be greater than 0 MPa' }))),
  kind: z.enum(['aluminium', 'steel', 'castIron', 'other'], need('must be "aluminium", "steel", "castIron" or "other"')),
});

/** 6061-T6: density 2.70 g/cm³, yield 276 MPa (Aluminum Association typical values). */
export const DEFAULT_MATERIAL = Object.freeze({ name: '6061-T6', densityGPerCm3: 2.7, yieldMpa: 276, kind: 'aluminium' as const });

export const tolerancesSchema = z.strictObject({
  /** allowed runout of the transmission axis on the crank axis, total indicator reading */
  alignmentTirMm: z._default(positiveMm, 0.127),
  /** ± on dimensions without their own tolerance */
  generalMm: z._default(positiveMm, 0.1),
  /** diameter of the position tolerance zone of holes */
  holePositionMm: z._default(positiveMm, 0.1),
  /** ± on the plate thickness */
  thicknessMm: z._default(positiveMm, 0.05),
  flatnessMm: z._default(positiveMm, 0.05),
});

export const plateSpecSchema = z
  .strictObject({
    schemaVersion: z.literal(1, need('must be 1 (this version of the plate spec)')),
    displayUnits: z.prefault(
      z.strictObject({
        length: z._default(z.enum(['mm', 'in'], need('must be "mm" or "in"')), 'mm'),
        /** inch values as fractions to 1/64 */
        fractions: z._default(z.boolean(), false),
      }),
      {},
    ),
    datum: z.prefault(
      z.strictObject({
        /** the plate's origin: always the crankshaft axis */
        origin: z._default(z.literal('crankshaftAxis', need('must be "crankshaftAxis"')), 'crankshaftAxis'),
        note: z.optional(noteSchema),
      }),
      {},
    ),
    partLabel: z.optional(z.string().check(z.trim(), z.minLength(1), z.maxLength(40))),
    engineFace: faceSchema,
    transmissionFace: faceSchema,
    centreBore: centreBoreSchema,
    starter: z.optional(starterSchema),
    thicknessMm: positiveMm.check(z.maximum(200, { error: 'must be at most 200 mm' })),
    /** which stock sizes the thickness is compared with */
    thicknessStock: z._default(z.enum(['metric', 'inch', 'any'], need('must be "metric", "inch" or "any"')), 'any'),
    stackUp: z.optional(stackUpInputsSchema),
    outline: z.prefault(outlineSchema, { kind: 'auto' }),
    /** 45° chamfer on both outer edges; 0 = sharp edges broken by hand */
    edgeChamferMm: z._default(nonNegativeMm, 0),
    material: z._default(materialSchema, DEFAULT_MATERIAL),
    tolerances: z.prefault(tolerancesSchema, {}),
    notes: z.optional(z.string().check(z.maxLength(4000))),
  })
  .check(z.superRefine((s, ctx) => {
    const reserved = new Set<string>(Object.values(RESERVED_FEATURE_IDS));
    const seen = new Map<string, string>();
    const claim = (id: string, path: (string | number)[]) => {
      const where = path.join('.');
      if (reserved.has(id)) {
        ctx.addIssue({ code: 'custom', message: `id "${id}" is reserved for the plate's own features (C1, S1, P1)`, path });
        return;
      }
      const first = seen.get(id);
      if (first !== undefined) {
        ctx.addIssue({ code: 'custom', message: `id "${id}" is already used by ${first}; feature ids are unique over the plate`, path });
      } else seen.set(id, where);
    };
    (['engineFace', 'transmissionFace'] as const).forEach((face) =>
      s[face].holes.forEach((h, i) => claim(h.id, [face, 'holes', i, 'id'])),
    );
    s.starter?.mountingHoles.forEach((h, i) => claim(h.id, ['starter', 'mountingHoles', i, 'id']));
    if (s.edgeChamferMm * 2 >= s.thicknessMm) {
      ctx.addIssue({
        code: 'custom',
        message: `edgeChamferMm ${s.edgeChamferMm} mm on both edges leaves no straight edge on a ${s.thicknessMm} mm plate`,
        path: ['edgeChamferMm'],
      });
    }
  }));

export type PlateSpec = z.infer<typeof plateSpecSchema>;
/** What a person or a program may write: defaults not filled in yet. */
export type PlateSpecInput = z.input<typeof plateSpecSchema>;
export type FaceSpec = PlateSpec['engineFace'];
export type HoleSpec = FaceSpec['holes'][number];
export type MeasuredHoleSpec = z.infer<typeof measuredHoleSchema>;
export type BoltPatternSpec = FaceSpec['patterns'][number];
export type StarterSpec = NonNullable<PlateSpec['starter']>;
export type StarterHoleSpec = StarterSpec['mountingHoles'][number];

export interface SpecIssue {
  /** dotted path, e.g. "engineFace.holes.3.colour"; "(spec)" for the document itself */
  readonly path: string;
  readonly pathSegments: readonly (string | number)[];
  readonly message: string;
}

/** Every problem of a failed parse, one per field, unknown fields named by their own path. */
export function specIssues(error: z.core.$ZodError): SpecIssue[] {
  const out: SpecIssue[] = [];
  for (const issue of error.issues) {
    const base = issue.path.filter((p): p is string | number => typeof p !== 'symbol');
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        const segs = [...base, key];
        out.push({ path: segs.join('.'), pathSegments: segs, message: `unknown field "${key}"` });
      }
      continue;
    }
    let message = issue.message;
    out.push({ path: base.length ? base.join('.') : '(spec)', pathSegments: base, message });
  }
  return out;
}

/**
 * Reads a plate spec (a parsed JSON value, or JSON text) and fills in its defaults.
 * @throws DomainError `spec.json` for text that is not JSON; `spec.invalid` listing every issue
 *   as `path: message` (its `.path` is the first issue's path)
 */
export function parsePlateSpec(json: unknown): PlateSpec {
  let value = json;
  if (typeof json === 'string') {
    try {
      value = JSON.parse(json);
    } catch (e) {
      throw new DomainError('spec.json', `The plate spec is not valid JSON: ${(e as Error).message}`);
    }
  }
  const result = plateSpecSchema.safeParse(value);
  if (result.success) return result.data;
  const issues = specIssues(result.error);
  const lines = issues.map((i) => `${i.path}: ${i.message}`);
  throw new DomainError(
    'spec.invalid',
    `The plate spec has ${issues.length === 1 ? 'a problem' : `${issues.length} problems`}:\n${lines.join('\n')}`,
    [...(issues[0]?.pathSegments ?? [])],
  );
}
