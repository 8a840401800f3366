/**
 * STEP AP214 (ISO 10303-214, IS edition) of a plate solid, millimetres, with the product named
 * after the part number and revision. The header's time stamp is the one given (default: a fixed
 * epoch), so the same solid and metadata always give the same bytes.
 */
import type { OpenCascadeInstance, TopoDS_Shape } from 'replicad-opencascadejs';
import { KERNEL_VERSION } from './version';

export interface StepMeta {
  readonly partNumber: string;
  readonly revision: string | number;
  /** ISO 8601, goes into the header's FILE_NAME time stamp */
  readonly timestampIso?: string;
  readonly author?: string;
  readonly organization?: string;
}

export function stepProductName(meta: Pick<StepMeta, 'partNumber' | 'revision'>): string {
  return `${meta.partNumber} rev ${meta.revision}`;
}

/** STEP strings: ISO 10303-21 escapes a quote by doubling it; keep to printable ASCII. */
function stepString(s: string): string {
  return s.replace(/[^\x20-\x7e]/g, '?').replace(/'/g, "''").replace(/\\/g, '\\\\');
}

let counter = 0;

export function plateStep(oc: OpenCascadeInstance, shape: TopoDS_Shape, meta: StepMeta): Uint8Array {
  const trash: { delete(): void }[] = [];
  const own = <T extends { delete(): void }>(o: T): T => {
    trash.push(o);
    return o;
  };
  const file = `/plate-${++counter}.step`;
  try {
    const name = stepProductName(meta);
    const doc = own(new oc.TDocStd_Document(own(new oc.TCollection_ExtendedString('XmlOcaf', true))));
    oc.XCAFDoc_ShapeTool.SetAutoNaming(false);
    const main = own(doc.Main());
    const tool = own(oc.XCAFDoc_DocumentTool.ShapeTool(main));
    const label = own(tool.NewShape());
    tool.SetShape(label, shape);
    own(oc.TDataStd_Name.Set(label, own(new oc.TCollection_ExtendedString(name, true))));
    oc.XCAFDoc_DocumentTool.SetLengthUnit(doc, 0.001); // the model is in millimetres (scale to the metre)

    own(new oc.STEPCAFControl_Writer()); // initialises the STEP static parameters
    oc.Interface_Static.SetCVal('xstep.cascade.unit', 'MM');
    oc.Interface_Static.SetCVal('write.step.unit', 'MM');
    oc.Interface_Static.SetIVal('write.step.schema', 4); // 4 = AP214 IS
    oc.Interface_Static.SetIVal('write.surfacecurve.mode', 1);
    oc.Interface_Static.SetIVal('write.precision.mode', 0);
    oc.Interface_Static.SetCVal('write.step.product.name', name);
    const session = own(new oc.XSControl_WorkSession());
    const writer = own(new oc.STEPCAFControl_Writer(session, false));
    writer.SetNameMode(true);
    writer.SetColorMode(false);
    writer.SetLayerMode(false);
    if (!writer.Perform(doc, file, own(new oc.Message_ProgressRange()))) {
      throw new Error('The STEP file could not be written by the kernel.');
    }
    const bytes = oc.FS.readFile(file) as Uint8Array;
    oc.FS.unlink(file);
    return rewriteHeader(bytes, meta);
  } finally {
    for (let i = trash.length - 1; i >= 0; i--) {
      try {
        trash[i]!.delete();
      } catch {
        /* handles released by their owner */
      }
    }
  }
}

/** Replaces the kernel's FILE_NAME header entry with ours (name, time stamp, author, system). */
function rewriteHeader(bytes: Uint8Array, meta: StepMeta): Uint8Array {
  const text = new TextDecoder('latin1').decode(bytes);
  const fileName = `${meta.partNumber}-rev${meta.revision}.step`;
  const stamp = meta.timestampIso ?? '1970-01-01T00:00:00';
  const entry =
    `FILE_NAME('${stepString(fileName)}','${stepString(stamp)}',('${stepString(meta.author ?? '')}'),` +
    `('${stepString(meta.organization ?? '')}'),'Platewright','${stepString(KERNEL_VERSION)}','');`;
  const out = text.replace(/FILE_NAME\([\s\S]*?\);/, entry);
  return new TextEncoder().encode(out);
}

/** Reads STEP bytes back into one shape (tests, and the check after export). Caller deletes it. */
export function readStep(oc: OpenCascadeInstance, bytes: Uint8Array): TopoDS_Shape {
  const file = `/read-${++counter}.step`;
  oc.FS.writeFile(file, bytes);
  const reader = new oc.STEPControl_Reader();
  try {
    const status = reader.ReadFile(file);
    if (status !== oc.IFSelect_ReturnStatus.IFSelect_RetDone) throw new Error(`The STEP file could not be read (${String(status)}).`);
    reader.TransferRoots(new oc.Message_ProgressRange());
    return reader.OneShape();
  } finally {
    reader.delete();
    try {
      oc.FS.unlink(file);
    } catch {
      /* already gone */
    }
  }
}
