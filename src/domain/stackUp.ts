/**
 * Axial tolerance stack-ups: one chain of dimensions → nominal, worst case and RSS; and the four
 * axial chains of an adapter plate installation.
 *
 * Sign convention (all chains): axial positions are measured along the crank axis REARWARDS
 * from the engine block's rear face, in mm. z = 0 is the block face; a positive value lies
 * towards the transmission, a negative value inside the block (e.g. a crank flange recessed
 * into the block). Offsets named "…FromX" are signed the same way: rearward of X is positive.
 * The plate's engine side is on the block face; its transmission side is at z = plate thickness.
 * `spacerMm` is anything else clamped between the block face and the bell housing face (gasket,
 * dust shield, extra spacer); it is taken to sit behind the plate, so the bell housing face is
 * at z = plate + spacer.
 *
 * Statistics: each dimension is a band [nominal − minus, nominal + plus]. Worst case adds the
 * band ends. RSS works about the band means (asymmetric tolerances shift the mean by
 * (plus − minus)/2) with a half band of √Σ((plus + minus)/2)²; each dimension's share of
 * variance is its squared half band over the sum.
 */
import { z } from 'zod/mini';
import { DomainError } from './errors';
import { formatLength } from './units';

// zod/mini loads no message language of its own: the stack-up's default messages are zod's
// English ones, as on the server, unless the app has already chosen a language.
if (!z.core.globalConfig.localeError) z.config(z.locales.en());

export interface StackDimension {
  readonly name: string;
  readonly nominalMm: number;
  /** upper deviation, ≥ 0 */
  readonly plusMm: number;
  /** lower deviation magnitude, ≥ 0 (the dimension may be as small as nominal − minus) */
  readonly minusMm: number;
  /** +1: adds to the result; −1: subtracts from it */
  readonly sense: 1 | -1;
}

export interface StackUpResult {
  readonly nominalMm: number;
  readonly worstCase: { readonly minMm: number; readonly maxMm: number };
  readonly rss: { readonly minMm: number; readonly maxMm: number };
  /** centre of the RSS band (nominal shifted by asymmetric tolerances) */
  readonly meanMm: number;
  readonly contributions: readonly { readonly name: string; readonly shareOfVariance: number }[];
}

function dimError(i: number, field: string, message: string): DomainError {
  return new DomainError('stackUp.invalid', `Stack-up dimension ${i} ${field}: ${message}`, ['chain', i, field]);
}

/** Nominal, worst case and RSS of a chain of dimensions. */
export function stackUp(chain: readonly StackDimension[]): StackUpResult {
  if (!Array.isArray(chain) || chain.length === 0) {
    throw new DomainError('stackUp.invalid', 'A stack-up needs at least one dimension.', ['chain']);
  }
  let nominal = 0;
  let wcMin = 0;
  let wcMax = 0;
  let mean = 0;
  const halves: number[] = [];
  chain.forEach((d, i) => {
    if (typeof d?.name !== 'string' || d.name.trim() === '') throw dimError(i, 'name', 'needs a name.');
    for (const f of ['nominalMm', 'plusMm', 'minusMm'] as const) {
      if (typeof d[f] !== 'number' || !Number.isFinite(d[f])) {
        throw dimError(i, f, `must be a finite number of mm, got ${String(d[f])} ("${d.name}").`);
      }
    }
    if (d.plusMm < 0) throw dimError(i, 'plusMm', `must be ≥ 0 (an upper deviation), got ${d.plusMm} ("${d.name}").`);
    if (d.minusMm < 0) {
      throw dimError(i, 'minusMm', `must be ≥ 0 (the size of the lower deviation), got ${d.minusMm} ("${d.name}").`);
    }
    if (d.sense !== 1 && d.sense !== -1) throw dimError(i, 'sense', `must be 1 or -1, got ${String(d.sense)} ("${d.name}").`);
    const lo = d.nominalMm - d.minusMm;
    const hi = d.nominalMm + d.plusMm;
    nominal += d.sense * d.nominalMm;
    if (d.sense === 1) {
      wcMin += lo;
      wcMax += hi;
    } else {
      wcMin -= hi;
      wcMax -= lo;
    }
    mean += d.sense * (d.nominalMm + (d.plusMm - d.minusMm) / 2);
    halves.push((d.plusMm + d.minusMm) / 2);
  });
  // squares of scaled half bands: no underflow for tiny tolerances
  const largest = Math.max(...halves);
  const scaled = halves.map((h) => (largest > 0 ? (h / largest) ** 2 : 0));
  const variance = scaled.reduce((a, b) => a + b, 0);
  const rssHalf = largest * Math.sqrt(variance);
  return Object.freeze({
    nominalMm: nominal,
    worstCase: Object.freeze({ minMm: wcMin, maxMm: wcMax }),
    rss: Object.freeze({ minMm: mean - rssHalf, maxMm: mean + rssHalf }),
    meanMm: mean,
    contributions: Object.freeze(
      chain.map((d, i) =>
        Object.freeze({ name: d.name, shareOfVariance: variance > 0 ? scaled[i]! / variance : 0 }),
      ),
    ),
  });
}

// ---------------------------------------------------------------------------------------------
// Inputs

/** A measured or specified length with its tolerance band, mm. */
export const tolerancedLengthSchema = z.strictObject({
  nominalMm: z.number(),
  plusMm: z._default(z.number().check(z.minimum(0)), 0),
  minusMm: z._default(z.number().check(z.minimum(0)), 0),
});
export type TolerancedLength = z.output<typeof tolerancedLengthSchema>;

/**
 * Required plate thickness: the plate moves the bell housing back by its thickness, and the
 * flywheel friction face must end up where the transmission expects it.
 *   thickness = crankFlangePosition + flywheelDepth − requiredBellFaceToFrictionFace − spacer
 */
export const plateThicknessInputSchema = z.strictObject({
  /** flywheel mounting face of the crank flange, rearward of the block face */
  crankFlangePositionMm: tolerancedLengthSchema,
  /** flywheel friction face, rearward of the crank flange face */
  flywheelDepthMm: tolerancedLengthSchema,
  /** the transmission's requirement: friction face rearward of its bell housing mating face */
  requiredBellFaceToFrictionFaceMm: tolerancedLengthSchema,
  spacerMm: z.optional(tolerancedLengthSchema),
  /** thinnest plate the builder accepts (optional) */
  minimumThicknessMm: z.optional(z.number().check(z.positive())),
});

/**
 * Input shaft pilot in the pilot bearing. The pilot tip sits at
 * z_tip = plate + spacer − pilotProtrusion.
 *   engagement (tip past the bearing's rear face) = pilotBearingRearFace − z_tip
 *   clearance to bottoming = z_tip − pilotBoreBottom
 */
export const pilotInputSchema = z
  .strictObject({
    plateThicknessMm: tolerancedLengthSchema,
    spacerMm: z.optional(tolerancedLengthSchema),
    /** entry (rear) face of the pilot bearing, rearward of the block face */
    pilotBearingRearFaceMm: tolerancedLengthSchema,
    /** deepest point the tip may reach (bore bottom or stop), rearward of the block face */
    pilotBoreBottomMm: tolerancedLengthSchema,
    /** the input shaft's pilot tip, FORWARD of the bell housing mating face */
    pilotProtrusionMm: tolerancedLengthSchema,
    minimumEngagementMm: z.number().check(z.minimum(0)),
    /** least gap between tip and bottom; default 0 (any gap) */
    minimumBottomClearanceMm: z._default(z.number().check(z.minimum(0)), 0),
  })
  .check(z.superRefine((v, ctx) => {
    if (v.pilotBoreBottomMm.nominalMm >= v.pilotBearingRearFaceMm.nominalMm) {
      ctx.addIssue({
        code: 'custom',
        path: ['pilotBoreBottomMm', 'nominalMm'],
        message: 'the bore bottom must lie forward of (smaller than) the pilot bearing rear face',
      });
    }
  }));

export const starterMountReferenceSchema = z.enum(['blockFace', 'plateRear', 'bellFace']);

/**
 * Starter pinion landing on the ring gear, with the pinion thrown (engaged).
 *   offset = pinionFront − ringGearFront
 *          = mountReference + mountOffset + engagedPinionFrontFromMount − crankFlange − ringGearFrontFromCrankFlange
 * mountReference: blockFace z = 0, plateRear z = plate, bellFace z = plate + spacer.
 * Overlap of the pinion [offset, offset + pinionWidth] with the ring gear [0, ringWidth].
 */
export const starterLandingInputSchema = z
  .strictObject({
    crankFlangePositionMm: tolerancedLengthSchema,
    /** front edge of the ring gear teeth, rearward of the crank flange face */
    ringGearFrontFromCrankFlangeMm: tolerancedLengthSchema,
    ringGearFaceWidthMm: z.number().check(z.positive()),
    starterMount: z.strictObject({
      reference: starterMountReferenceSchema,
      /** starter mounting face, rearward of the reference (negative: forward, e.g. a pocket floor) */
      offsetMm: tolerancedLengthSchema,
    }),
    plateThicknessMm: z.optional(tolerancedLengthSchema),
    spacerMm: z.optional(tolerancedLengthSchema),
    /** front face of the engaged pinion, rearward of the starter mounting face */
    engagedPinionFrontFromMountMm: tolerancedLengthSchema,
    pinionFaceWidthMm: z.number().check(z.positive()),
    minimumEngagementMm: z.number().check(z.minimum(0)),
  })
  .check(z.superRefine((v, ctx) => {
    if (v.starterMount.reference !== 'blockFace' && v.plateThicknessMm === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['plateThicknessMm'],
        message: `needed when the starter mounts to the ${v.starterMount.reference === 'plateRear' ? "plate's rear face" : 'bell housing face'}`,
      });
    }
  }));

/**
 * Clutch release bearing. Finger (diaphragm tip) positions are measured with the clutch engaged
 * and fully disengaged; the bearing face at rest (fully retracted).
 *   clearance at rest = (plate + spacer + bearingRestFromBellFace) − (crankFlange + flywheelDepth + fingersEngaged)
 *   travel to disengage = (plate + spacer + bearingRestFromBellFace) − (crankFlange + flywheelDepth + fingersDisengaged)
 */
export const releaseBearingInputSchema = z
  .strictObject({
    plateThicknessMm: tolerancedLengthSchema,
    spacerMm: z.optional(tolerancedLengthSchema),
    crankFlangePositionMm: tolerancedLengthSchema,
    flywheelDepthMm: tolerancedLengthSchema,
    /** finger contact plane, rearward of the friction face, clutch engaged */
    fingersEngagedFromFrictionFaceMm: tolerancedLengthSchema,
    /** finger contact plane, rearward of the friction face, clutch fully disengaged */
    fingersDisengagedFromFrictionFaceMm: tolerancedLengthSchema,
    /** release bearing face at rest, rearward of the bell housing mating face */
    bearingRestFromBellFaceMm: tolerancedLengthSchema,
    /** stroke of the bearing (fork or slave cylinder) from rest */
    availableTravelMm: z.number().check(z.positive()),
    /** least gap at rest; default 0. Negative for a bearing designed to run preloaded. */
    minimumClearanceMm: z._default(z.number(), 0),
  })
  .check(z.superRefine((v, ctx) => {
    if (v.fingersDisengagedFromFrictionFaceMm.nominalMm >= v.fingersEngagedFromFrictionFaceMm.nominalMm) {
      ctx.addIssue({
        code: 'custom',
        path: ['fingersDisengagedFromFrictionFaceMm', 'nominalMm'],
        message: 'the fingers move forward to disengage: the disengaged position must be smaller than the engaged one',
      });
    }
  }));

export const stackUpInputsSchema = z.strictObject({
  plateThickness: z.optional(plateThicknessInputSchema),
  pilot: z.optional(pilotInputSchema),
  starterLanding: z.optional(starterLandingInputSchema),
  releaseBearing: z.optional(releaseBearingInputSchema),
});

export type StackUpInputs = z.input<typeof stackUpInputsSchema>;
export type PlateThicknessInput = z.input<typeof plateThicknessInputSchema>;
export type PilotInput = z.input<typeof pilotInputSchema>;
export type StarterLandingInput = z.input<typeof starterLandingInputSchema>;
export type ReleaseBearingInput = z.input<typeof releaseBearingInputSchema>;

// ---------------------------------------------------------------------------------------------
// Verdicts

export interface StackUpVerdict {
  readonly chain: readonly StackDimension[];
  readonly result: StackUpResult;
  readonly ok: boolean;
  readonly message: string;
}

export interface ChainResult {
  readonly chain: readonly StackDimension[];
  readonly result: StackUpResult;
}

export interface PilotVerdict extends StackUpVerdict {
  /** chain/result above: engagement; this: clearance between tip and bore bottom */
  readonly bottomClearance: ChainResult;
}

export interface StarterLandingVerdict extends StackUpVerdict {
  /** chain/result above: pinion front − ring gear front (axial offset) */
  readonly engagementMm: {
    readonly nominal: number;
    readonly worstCaseMin: number;
    readonly rssMin: number;
  };
}

export interface ReleaseBearingVerdict extends StackUpVerdict {
  /** chain/result above: clearance at rest (clutch engaged); this: stroke needed to disengage */
  readonly travelToDisengage: ChainResult;
}

export interface StackUpEvaluation {
  readonly plateThickness?: StackUpVerdict;
  readonly pilot?: PilotVerdict;
  readonly starterLanding?: StarterLandingVerdict;
  readonly releaseBearing?: ReleaseBearingVerdict;
}

function parse<S extends z.ZodMiniType>(schema: S, input: unknown, root: string): z.output<S> {
  const r = schema.safeParse(input);
  if (r.success) return r.data;
  const issues = r.error.issues.map((i) => {
    const p = [root, ...i.path.map(String)].filter(Boolean).join('.');
    return `${p}: ${i.message}`;
  });
  const first = r.error.issues[0];
  const path = [root, ...(first?.path ?? []).map((k) => (typeof k === 'number' ? k : String(k)))].filter((k) => k !== '');
  throw new DomainError('stackUp.invalid', `Stack-up inputs are not valid — ${issues.join('; ')}`, path);
}

function dim(name: string, t: TolerancedLength, sense: 1 | -1): StackDimension {
  return Object.freeze({ name, nominalMm: t.nominalMm, plusMm: t.plusMm, minusMm: t.minusMm, sense });
}

const mm = (v: number): string => formatLength(v, 'mm');
const band = (b: { minMm: number; maxMm: number }): string => `${mm(b.minMm)} to ${mm(b.maxMm)}`;

export function plateThicknessStackUp(input: PlateThicknessInput): StackUpVerdict {
  const v = parse(plateThicknessInputSchema, input, 'plateThickness');
  const chain: StackDimension[] = [
    dim('crank flange position', v.crankFlangePositionMm, 1),
    dim('flywheel depth (friction face behind crank flange)', v.flywheelDepthMm, 1),
    dim('transmission: friction face behind bell housing face', v.requiredBellFaceToFrictionFaceMm, -1),
  ];
  if (v.spacerMm) chain.push(dim('spacer', v.spacerMm, -1));
  const result = stackUp(chain);
  const spread = `worst case ${band(result.worstCase)}, RSS ${band(result.rss)}`;
  let ok = true;
  let message: string;
  if (result.worstCase.minMm <= 0) {
    ok = false;
    message =
      result.nominalMm <= 0
        ? `No plate can work: the friction face sits ${mm(-result.nominalMm)} too far forward for the transmission even with no plate (${spread}). Move the friction face rearward (flywheel spacer or a deeper flywheel).`
        : `The required thickness is only ${mm(result.nominalMm)} nominal and can reach zero or less within the tolerances (${spread}); tighten the measurements or move the friction face rearward.`;
  } else if (v.minimumThicknessMm !== undefined && result.worstCase.minMm < v.minimumThicknessMm) {
    ok = false;
    message = `The plate would need to be ${mm(result.nominalMm)} thick (${spread}), thinner than the ${mm(v.minimumThicknessMm)} minimum; move the friction face rearward by the difference to use a thicker plate.`;
  } else {
    message = `The plate must be ${mm(result.nominalMm)} thick for the friction face to sit where the transmission expects it (${spread}).`;
  }
  return Object.freeze({ chain: Object.freeze(chain), result, ok, message });
}

export function pilotStackUp(input: PilotInput): PilotVerdict {
  const v = parse(pilotInputSchema, input, 'pilot');
  const engagementChain: StackDimension[] = [
    dim('pilot bearing rear face position', v.pilotBearingRearFaceMm, 1),
    dim('plate thickness', v.plateThicknessMm, -1),
  ];
  if (v.spacerMm) engagementChain.push(dim('spacer', v.spacerMm, -1));
  engagementChain.push(dim('pilot protrusion ahead of bell housing face', v.pilotProtrusionMm, 1));

  const bottomChain: StackDimension[] = [dim('plate thickness', v.plateThicknessMm, 1)];
  if (v.spacerMm) bottomChain.push(dim('spacer', v.spacerMm, 1));
  bottomChain.push(dim('pilot protrusion ahead of bell housing face', v.pilotProtrusionMm, -1));
  bottomChain.push(dim('pilot bore bottom position', v.pilotBoreBottomMm, -1));

  const result = stackUp(engagementChain);
  const bottom = stackUp(bottomChain);
  const engagedOk = result.worstCase.minMm >= v.minimumEngagementMm;
  const bottomOk = bottom.worstCase.minMm > 0 && bottom.worstCase.minMm >= v.minimumBottomClearanceMm;
  const parts: string[] = [];
  parts.push(
    engagedOk
      ? `The pilot enters the bearing ${mm(result.nominalMm)} (at least ${mm(result.worstCase.minMm)} worst case, ${mm(v.minimumEngagementMm)} required).`
      : `Too little pilot engagement: ${mm(result.nominalMm)} nominal, ${mm(result.worstCase.minMm)} worst case, ${mm(v.minimumEngagementMm)} required — the plate pulls the shaft back too far; use a thinner plate, a longer pilot or a pilot bearing set further rearward.`,
  );
  parts.push(
    bottomOk
      ? `It stops ${mm(bottom.nominalMm)} short of the bore bottom (at least ${mm(bottom.worstCase.minMm)} worst case).`
      : `The pilot can bottom: clearance ${mm(bottom.nominalMm)} nominal, ${mm(bottom.worstCase.minMm)} worst case${v.minimumBottomClearanceMm > 0 ? `, ${mm(v.minimumBottomClearanceMm)} required` : ''} — shorten the pilot or use a thicker plate.`,
  );
  return Object.freeze({
    chain: Object.freeze(engagementChain),
    result,
    ok: engagedOk && bottomOk,
    message: parts.join(' '),
    bottomClearance: Object.freeze({ chain: Object.freeze(bottomChain), result: bottom }),
  });
}

/** Axial overlap of the pinion [offset, offset + wp] with the ring gear [0, wr]. */
export function toothOverlapMm(offsetMm: number, pinionWidthMm: number, ringWidthMm: number): number {
  return Math.max(0, Math.min(offsetMm + pinionWidthMm, ringWidthMm) - Math.max(offsetMm, 0));
}

export function starterLandingStackUp(input: StarterLandingInput): StarterLandingVerdict {
  const v = parse(starterLandingInputSchema, input, 'starterLanding');
  const chain: StackDimension[] = [];
  const ref = v.starterMount.reference;
  if (ref !== 'blockFace') chain.push(dim('plate thickness', v.plateThicknessMm!, 1));
  if (ref === 'bellFace' && v.spacerMm) chain.push(dim('spacer', v.spacerMm, 1));
  chain.push(dim('starter mounting face offset', v.starterMount.offsetMm, 1));
  chain.push(dim('engaged pinion front behind mounting face', v.engagedPinionFrontFromMountMm, 1));
  chain.push(dim('crank flange position', v.crankFlangePositionMm, -1));
  chain.push(dim('ring gear front behind crank flange', v.ringGearFrontFromCrankFlangeMm, -1));
  const result = stackUp(chain);
  const wp = v.pinionFaceWidthMm;
  const wr = v.ringGearFaceWidthMm;
  const at = (offset: number): number => toothOverlapMm(offset, wp, wr);
  // overlap is trapezoidal in the offset: its minimum over a band is at one of the band ends
  const engagement = Object.freeze({
    nominal: at(result.nominalMm),
    worstCaseMin: Math.min(at(result.worstCase.minMm), at(result.worstCase.maxMm)),
    rssMin: Math.min(at(result.rss.minMm), at(result.rss.maxMm)),
  });
  const ok = engagement.worstCaseMin >= v.minimumEngagementMm;
  const where =
    Math.abs(result.nominalMm) < 1e-9
      ? 'flush with the ring gear front'
      : result.nominalMm > 0
        ? `${mm(result.nominalMm)} behind the ring gear front`
        : `${mm(-result.nominalMm)} ahead of the ring gear front`;
  const message = ok
    ? `The engaged pinion lands ${where}: ${mm(engagement.nominal)} of tooth overlap nominal, at least ${mm(engagement.worstCaseMin)} worst case (${mm(v.minimumEngagementMm)} required).`
    : `Too little tooth overlap: the engaged pinion lands ${where}, ${mm(engagement.nominal)} overlap nominal, ${mm(engagement.worstCaseMin)} worst case, ${mm(v.minimumEngagementMm)} required — move the starter mounting face (e.g. recess it in a pocket or add a shim) so the pinion lines up with the ring gear.`;
  return Object.freeze({ chain: Object.freeze(chain), result, ok, message, engagementMm: engagement });
}

export function releaseBearingStackUp(input: ReleaseBearingInput): ReleaseBearingVerdict {
  const v = parse(releaseBearingInputSchema, input, 'releaseBearing');
  const common = (): StackDimension[] => {
    const c: StackDimension[] = [dim('plate thickness', v.plateThicknessMm, 1)];
    if (v.spacerMm) c.push(dim('spacer', v.spacerMm, 1));
    c.push(dim('release bearing at rest behind bell housing face', v.bearingRestFromBellFaceMm, 1));
    c.push(dim('crank flange position', v.crankFlangePositionMm, -1));
    c.push(dim('flywheel depth (friction face behind crank flange)', v.flywheelDepthMm, -1));
    return c;
  };
  const chain = [...common(), dim('fingers behind friction face, clutch engaged', v.fingersEngagedFromFrictionFaceMm, -1)];
  const travelChain = [
    ...common(),
    dim('fingers behind friction face, clutch disengaged', v.fingersDisengagedFromFrictionFaceMm, -1),
  ];
  const result = stackUp(chain);
  const travel = stackUp(travelChain);
  const clearanceOk = result.worstCase.minMm >= v.minimumClearanceMm;
  const travelOk = travel.worstCase.maxMm <= v.availableTravelMm;
  const parts: string[] = [];
  parts.push(
    clearanceOk
      ? `At rest the release bearing clears the fingers by ${mm(result.nominalMm)} (worst case ${band(result.worstCase)}).`
      : result.worstCase.minMm < 0 && v.minimumClearanceMm >= 0
        ? `The release bearing can press on the fingers at rest (clearance ${mm(result.nominalMm)} nominal, ${mm(result.worstCase.minMm)} worst case): the clutch may slip — move the bearing rearward or the friction face forward.`
        : `Too little clearance at rest: ${mm(result.nominalMm)} nominal, ${mm(result.worstCase.minMm)} worst case, ${mm(v.minimumClearanceMm)} required.`,
  );
  parts.push(
    travelOk
      ? `Disengaging takes ${mm(travel.nominalMm)} of stroke (at most ${mm(travel.worstCase.maxMm)} worst case) of the ${mm(v.availableTravelMm)} available.`
      : `Not enough stroke to disengage: up to ${mm(travel.worstCase.maxMm)} needed worst case (${mm(travel.nominalMm)} nominal), ${mm(v.availableTravelMm)} available — the clutch may not release fully; move the bearing forward (adjustable slave or spacer) or reduce the gap.`,
  );
  return Object.freeze({
    chain: Object.freeze(chain),
    result,
    ok: clearanceOk && travelOk,
    message: parts.join(' '),
    travelToDisengage: Object.freeze({ chain: Object.freeze(travelChain), result: travel }),
  });
}

/** Evaluates every chain present in the inputs. */
export function evaluateStackUps(inputs: StackUpInputs): StackUpEvaluation {
  const v = parse(stackUpInputsSchema, inputs, '');
  const out: {
    plateThickness?: StackUpVerdict;
    pilot?: PilotVerdict;
    starterLanding?: StarterLandingVerdict;
    releaseBearing?: ReleaseBearingVerdict;
  } = {};
  if (v.plateThickness) out.plateThickness = plateThicknessStackUp(v.plateThickness);
  if (v.pilot) out.pilot = pilotStackUp(v.pilot);
  if (v.starterLanding) out.starterLanding = starterLandingStackUp(v.starterLanding);
  if (v.releaseBearing) out.releaseBearing = releaseBearingStackUp(v.releaseBearing);
  return Object.freeze(out);
}
