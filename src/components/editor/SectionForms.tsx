import { useEffect, useRef, type ReactNode } from 'react';
import { useForm, type FieldValues, type Path, type UseFormReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod/mini';
import { centreBoreSchema, materialSchema, type PlateSpecInput } from '~/domain';
import { STOCK_THICKNESSES } from '~/domain/stockThickness';
import { bothUnits, editText, readLength, type DisplayUnits } from '~/domain/editor/units';
import type { Commit } from './HoleTable';

/** An issue of a text field's reading (zod/mini hands a transform the bare parse payload). */
function addIssue(ctx: z.core.ParsePayload, message: string): void {
  ctx.issues.push({ code: 'custom', message, input: ctx.value });
}

/** A text field read as a length in the display unit; the message names what is wrong. */
export function lengthText(units: DisplayUnits, opts: { positive?: boolean; min?: number } = {}) {
  return z.pipe(
    z.string(),
    z.transform((t: string, ctx): number => {
      const v = readLength(t, units, opts);
      if (!v.ok) {
        addIssue(ctx, v.message);
        return z.NEVER;
      }
      return v.mm;
    }),
  );
}

/** The same; an empty field means "none". */
export function optionalLengthText(units: DisplayUnits, opts: { positive?: boolean; min?: number } = {}) {
  return z.pipe(
    z.string(),
    z.transform((t: string, ctx): number | undefined => {
      if (t.trim() === '') return undefined;
      const v = readLength(t, units, opts);
      if (!v.ok) {
        addIssue(ctx, v.message);
        return z.NEVER;
      }
      return v.mm;
    }),
  );
}

const numberText = (what: string, opts: { int?: boolean; positive?: boolean; min?: number; max?: number } = {}) =>
  z.pipe(
    z.string(),
    z.transform((t: string, ctx) => {
      const n = Number(t.trim());
      if (t.trim() === '' || !Number.isFinite(n)) {
        addIssue(ctx, `enter ${what} as a number`);
        return z.NEVER;
      }
      if (opts.int && !Number.isInteger(n)) addIssue(ctx, `${what} is a whole number`);
      if (opts.positive && !(n > 0)) addIssue(ctx, `${what} must be greater than 0`);
      if (opts.min !== undefined && n < opts.min) addIssue(ctx, `${what} must be at least ${opts.min}`);
      if (opts.max !== undefined && n > opts.max) addIssue(ctx, `${what} must be at most ${opts.max}`);
      return n;
    }),
  );

/**
 * react-hook-form over one section of the spec: fields are text, the zod schema reads them (and
 * checks the section with the plate spec's own schema part); every change that reads commits.
 * When the document changes from elsewhere (undo, a helper), the fields follow it; the field the
 * builder is typing into is left alone.
 */
function useSectionForm<T extends FieldValues, O>(schema: z.ZodMiniType<O, T>, text: T, onValid: (out: O) => void): UseFormReturn<T, unknown, O> {
  // sync: nothing here is async, and a sync parse keeps the fields' order in issues and output
  // (zod/mini's transforms resolve late in an async parse, which would move their fields last)
  const form = useForm<T, unknown, O>({ resolver: zodResolver(schema as never, undefined, { mode: 'sync' }) as never, mode: 'onChange', defaultValues: text as never });
  const own = useRef(false);
  const prev = useRef(text);
  const validRef = useRef(onValid);
  validRef.current = onValid;
  useEffect(() => {
    const sub = form.watch(() => {
      void form.handleSubmit((out) => {
        own.current = true;
        validRef.current(out);
      })();
    });
    return () => sub.unsubscribe();
  }, [form]);
  useEffect(() => {
    if (own.current) {
      own.current = false;
      prev.current = text;
      return;
    }
    for (const k of Object.keys(text) as Path<T>[]) {
      if ((prev.current as Record<string, unknown>)[k] !== (text as Record<string, unknown>)[k]) form.setValue(k, (text as Record<string, never>)[k], { shouldValidate: true });
    }
    prev.current = text;
  });
  return form;
}

function Field({ label, error, hint, children, wide }: { label: string; error?: string; hint?: ReactNode; children: ReactNode; wide?: boolean }) {
  return (
    <label className={`block ${wide ? 'col-span-2' : ''}`}>
      <span className="block text-[13px] font-semibold uppercase tracking-wide text-plate-700">{label}</span>
      {children}
      {error ? (
        <span role="alert" className="mt-0.5 block text-sm font-semibold text-finding-error">{error}</span>
      ) : hint ? (
        <span className="mt-0.5 block font-mono text-xs text-plate-500">{hint}</span>
      ) : null}
    </label>
  );
}

const inputCls = (bad?: boolean) =>
  `mt-0.5 w-full rounded border px-2 py-1.5 font-mono text-[15px] tabular-nums outline-none focus:ring-2 focus:ring-brass-500 ${bad ? 'border-finding-error bg-red-50' : 'border-blast-200 bg-white'}`;

function LengthFieldHint({ text, units }: { text: string; units: DisplayUnits }) {
  const v = readLength(text, units, { optional: true });
  return v.ok && Number.isFinite(v.mm) ? <>{bothUnits(v.mm)}</> : null;
}

// ---------------------------------------------------------------------------------------------

export function PlateSection({ doc, units, commit, issues, readOnly }: { doc: PlateSpecInput; units: DisplayUnits; commit: Commit; issues: ReadonlyMap<string, string>; readOnly: boolean }) {
  const auto = (doc.outline?.kind ?? 'auto') === 'auto';
  const outline = doc.outline as { kind: 'auto'; edgeMarginMm?: number; cornerRadiusMm?: number } | undefined;
  const mat = doc.material ?? { name: '6061-T6', densityGPerCm3: 2.7, kind: 'aluminium' as const };
  const schema = z
    .object({
      partLabel: z.string().check(z.maxLength(40, { error: 'at most 40 characters' })),
      thickness: lengthText(units, { positive: true }),
      stock: z.enum(['metric', 'inch', 'any']),
      chamfer: lengthText(units, { min: 0 }),
      margin: lengthText(units, { min: 0 }),
      corner: lengthText(units, { min: 0 }),
      materialName: z.string().check(z.trim(), z.minLength(1, { error: 'name the material' }), z.maxLength(60)),
      materialKind: materialSchema.shape.kind,
      density: numberText('the density', { positive: true, max: 25 }),
    })
    .check(z.superRefine((v, ctx) => {
      if (typeof v.thickness === 'number' && v.thickness > 200) ctx.addIssue({ code: 'custom', path: ['thickness'], message: 'at most 200 mm' });
      if (typeof v.chamfer === 'number' && typeof v.thickness === 'number' && v.chamfer * 2 >= v.thickness) ctx.addIssue({ code: 'custom', path: ['chamfer'], message: 'a chamfer on both edges must leave a straight edge' });
    }));
  const text = {
    partLabel: doc.partLabel ?? '',
    thickness: editText(doc.thicknessMm, units),
    stock: doc.thicknessStock ?? 'any',
    chamfer: editText(doc.edgeChamferMm ?? 0, units),
    margin: editText(auto ? (outline?.edgeMarginMm ?? 12) : 12, units),
    corner: editText(doc.outline?.cornerRadiusMm ?? 10, units),
    materialName: mat.name,
    materialKind: mat.kind,
    density: String(mat.densityGPerCm3),
  };
  const form = useSectionForm(schema, text, (v) => {
    const next: PlateSpecInput = {
      ...doc,
      thicknessMm: v.thickness,
      thicknessStock: v.stock,
      edgeChamferMm: v.chamfer,
      material: { ...mat, name: v.materialName, kind: v.materialKind, densityGPerCm3: v.density },
      outline: auto ? { kind: 'auto', edgeMarginMm: v.margin, cornerRadiusMm: v.corner } : { ...(doc.outline as object), cornerRadiusMm: v.corner } as PlateSpecInput['outline'],
    };
    if (v.partLabel.trim()) next.partLabel = v.partLabel.trim();
    else delete next.partLabel;
    commit(next, 'plate-form');
  });
  const e = form.formState.errors;
  const w = form.watch();
  const stock = STOCK_THICKNESSES.filter((s) => (w.stock === 'any' ? true : s.system === w.stock));
  return (
    <fieldset disabled={readOnly} className="grid grid-cols-2 gap-x-4 gap-y-3" data-testid="plate-form">
      <Field label="Part label (engraved)" error={e.partLabel?.message}>
        <input {...form.register('partLabel')} className={inputCls(!!e.partLabel)} />
      </Field>
      <Field label={`Thickness (${units.length})`} error={e.thickness?.message ?? issues.get('thicknessMm')} hint={<LengthFieldHint text={w.thickness} units={units} />}>
        <input {...form.register('thickness')} list="stock-thicknesses" className={inputCls(!!e.thickness)} />
        <datalist id="stock-thicknesses">{stock.map((s) => <option key={s.label} value={editText(s.thicknessMm, units)}>{s.label}</option>)}</datalist>
      </Field>
      <Field label="Stock sizes to match">
        <select {...form.register('stock')} className={inputCls()}>
          <option value="any">metric or inch</option>
          <option value="metric">metric (6–25 mm)</option>
          <option value="inch">inch (1/4–1 in)</option>
        </select>
      </Field>
      <Field label={`Edge chamfer (${units.length})`} error={e.chamfer?.message ?? issues.get('edgeChamferMm')} hint={<LengthFieldHint text={w.chamfer} units={units} />}>
        <input {...form.register('chamfer')} className={inputCls(!!e.chamfer)} />
      </Field>
      {auto && (
        <Field label={`Outline: edge margin (${units.length})`} error={e.margin?.message} hint={<LengthFieldHint text={w.margin} units={units} />}>
          <input {...form.register('margin')} className={inputCls(!!e.margin)} />
        </Field>
      )}
      <Field label={`Outline: ${auto ? 'corner radius' : 'common corner radius'} (${units.length})`} error={e.corner?.message ?? issues.get('outline.cornerRadiusMm')} hint={<LengthFieldHint text={w.corner} units={units} />}>
        <input {...form.register('corner')} className={inputCls(!!e.corner)} />
      </Field>
      <Field label="Material" error={e.materialName?.message}>
        <input {...form.register('materialName')} className={inputCls(!!e.materialName)} />
      </Field>
      <Field label="Material kind (thread engagement rule)">
        <select {...form.register('materialKind')} className={inputCls()}>
          <option value="aluminium">aluminium</option>
          <option value="steel">steel</option>
          <option value="castIron">cast iron</option>
          <option value="other">other</option>
        </select>
      </Field>
      <Field label="Density (g/cm³)" error={e.density?.message}>
        <input {...form.register('density')} className={inputCls(!!e.density)} />
      </Field>
      <p className="col-span-2 text-xs text-plate-500">Outline: {auto ? 'automatic — hull of every feature plus the edge margin, corners filleted' : 'your own polygon (corners in the Outline section above; a corner with its own radius keeps it)'}.</p>
    </fieldset>
  );
}

export function CentreBoreSection({ doc, units, commit, issues, readOnly }: { doc: PlateSpecInput; units: DisplayUnits; commit: Commit; issues: ReadonlyMap<string, string>; readOnly: boolean }) {
  const c = doc.centreBore;
  const fields = z.object({ kind: z.enum(['bore', 'register']), diameter: lengthText(units, { positive: true }), fit: z.string() });
  const schema = z.pipe(
    z.pipe(fields, z.transform((v: z.output<typeof fields>) => ({ kind: v.kind, diameterMm: v.diameter, ...(v.fit.trim() ? { fit: v.fit.trim() } : {}), ...(c.note ? { note: c.note } : {}) }))),
    centreBoreSchema,
  );
  const text = { kind: c.kind, diameter: editText(c.diameterMm, units), fit: c.fit ?? '' };
  const form = useSectionForm(schema, text, (v) => commit({ ...doc, centreBore: v }, 'bore-form'));
  const e = form.formState.errors as Record<string, { message?: string } | undefined>;
  const w = form.watch();
  return (
    <fieldset disabled={readOnly} className="grid grid-cols-2 gap-x-4 gap-y-3" data-testid="bore-form">
      <Field label="Centre feature">
        <select {...form.register('kind')} className={inputCls()}>
          <option value="bore">clearance bore (crank flange / seal)</option>
          <option value="register">locating register (fit)</option>
        </select>
      </Field>
      <Field label={`Diameter (${units.length})`} error={e.diameter?.message ?? e.diameterMm?.message ?? issues.get('centreBore.diameterMm')} hint={<LengthFieldHint text={w.diameter} units={units} />}>
        <input {...form.register('diameter')} className={inputCls(!!(e.diameter ?? e.diameterMm))} />
      </Field>
      <Field label="Fit (ISO 286 hole class, e.g. H7)" error={e.fit?.message ?? issues.get('centreBore.fit')}>
        <input {...form.register('fit')} placeholder={w.kind === 'register' ? 'H7' : 'none'} className={inputCls(!!e.fit)} />
      </Field>
    </fieldset>
  );
}

export function StarterSection({ doc, units, commit, issues, readOnly }: { doc: PlateSpecInput; units: DisplayUnits; commit: Commit; issues: ReadonlyMap<string, string>; readOnly: boolean }) {
  const s = doc.starter;
  if (!s) {
    return (
      <div className="text-sm">
        <p className="text-plate-700">No starter on this plate.</p>
        <button type="button" disabled={readOnly} className="mt-2 rounded border border-plate-700 px-3 py-1.5 font-semibold text-plate-900 hover:bg-plate-100"
          onClick={() => commit({ ...doc, starter: { side: 'engine', ringGear: { teeth: 130, moduleMm: 2.5 }, pinion: { teeth: 10 }, angleDeg: 300, noseBoreDiameterMm: 76, mountingHoles: [] } })}>
          Add a starter
        </button>
      </div>
    );
  }
  return <StarterForm doc={doc} units={units} commit={commit} issues={issues} readOnly={readOnly} />;
}

function StarterForm({ doc, units, commit, issues, readOnly }: { doc: PlateSpecInput; units: DisplayUnits; commit: Commit; issues: ReadonlyMap<string, string>; readOnly: boolean }) {
  const s = doc.starter!;
  const metric = s.ringGear.moduleMm !== undefined;
  const schema = z.object({
    angle: numberText('the angle'),
    nose: lengthText(units, { positive: true }),
    noseFit: z.string(),
    teeth: numberText('ring gear teeth', { int: true, min: 20, max: 400 }),
    pitch: numberText(metric ? 'the module' : 'the diametral pitch', { positive: true }),
    pinion: numberText('pinion teeth', { int: true, min: 5, max: 40 }),
    recessDepth: optionalLengthText(units, { positive: true }),
    recessDia: optionalLengthText(units, { positive: true }),
  });
  const rc = s.recess?.shape.kind === 'circle' ? s.recess.shape.diameterMm : undefined;
  const text = {
    angle: String(s.angleDeg),
    nose: editText(s.noseBoreDiameterMm, units),
    noseFit: s.noseFit ?? '',
    teeth: String(s.ringGear.teeth),
    pitch: String(metric ? s.ringGear.moduleMm : s.ringGear.diametralPitch),
    pinion: String(s.pinion.teeth),
    recessDepth: s.recess ? editText(s.recess.depthMm, units) : '',
    recessDia: rc !== undefined ? editText(rc, units) : '',
  };
  const form = useSectionForm(schema, text, (v) => {
    const starter = { ...s, angleDeg: v.angle, noseBoreDiameterMm: v.nose, ringGear: metric ? { teeth: v.teeth, moduleMm: v.pitch } : { teeth: v.teeth, diametralPitch: v.pitch }, pinion: { teeth: v.pinion } } as NonNullable<PlateSpecInput['starter']>;
    if (v.noseFit.trim()) starter.noseFit = v.noseFit.trim();
    else delete starter.noseFit;
    if (v.recessDepth !== undefined && v.recessDia !== undefined) starter.recess = { ...s.recess, depthMm: v.recessDepth, shape: { kind: 'circle', diameterMm: v.recessDia } };
    else if (v.recessDepth === undefined && v.recessDia === undefined) delete starter.recess;
    commit({ ...doc, starter }, 'starter-form');
  });
  const e = form.formState.errors;
  const w = form.watch();
  return (
    <fieldset disabled={readOnly} className="grid grid-cols-2 gap-x-4 gap-y-3" data-testid="starter-form">
      <Field label="Nose bore position (° CCW from +X)" error={e.angle?.message}>
        <input {...form.register('angle')} className={inputCls(!!e.angle)} />
      </Field>
      <Field label={`Nose bore ⌀ (${units.length})`} error={e.nose?.message ?? issues.get('starter.noseBoreDiameterMm')} hint={<LengthFieldHint text={w.nose} units={units} />}>
        <input {...form.register('nose')} className={inputCls(!!e.nose)} />
      </Field>
      <Field label="Nose bore fit (e.g. H8)" error={e.noseFit?.message ?? issues.get('starter.noseFit')}>
        <input {...form.register('noseFit')} className={inputCls(!!(e.noseFit ?? issues.get('starter.noseFit')))} />
      </Field>
      <Field label="Ring gear teeth" error={e.teeth?.message}>
        <input {...form.register('teeth')} className={inputCls(!!e.teeth)} />
      </Field>
      <Field label={metric ? 'Module (mm)' : 'Diametral pitch (1/in)'} error={e.pitch?.message}>
        <input {...form.register('pitch')} className={inputCls(!!e.pitch)} />
      </Field>
      <Field label="Pinion teeth" error={e.pinion?.message}>
        <input {...form.register('pinion')} className={inputCls(!!e.pinion)} />
      </Field>
      <Field label={`Recess depth (${units.length}, blank = none)`} error={e.recessDepth?.message} hint={<LengthFieldHint text={w.recessDepth} units={units} />}>
        <input {...form.register('recessDepth')} className={inputCls(!!e.recessDepth)} />
      </Field>
      <Field label={`Recess ⌀ (${units.length})`} error={e.recessDia?.message} hint={<LengthFieldHint text={w.recessDia} units={units} />}>
        <input {...form.register('recessDia')} className={inputCls(!!e.recessDia)} />
      </Field>
      <p className="col-span-2 text-xs text-plate-500">Mounting holes: {(s.mountingHoles ?? []).map((h) => h.id).join(', ') || 'none'} (placed from the nose bore centre).</p>
      <button type="button" className="col-span-2 justify-self-start text-sm text-finding-error underline" onClick={() => { const { starter: _, ...rest } = doc; commit(rest as PlateSpecInput); }}>Remove the starter</button>
    </fieldset>
  );
}
