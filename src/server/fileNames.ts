/** The files a revision offers, in the order the shop reads them. */
export const FILE_NAMES = ['drawing.pdf', 'plate.dxf', 'plate.step', 'plate.svg', 'holes.csv'] as const;
export type FileName = (typeof FILE_NAMES)[number];

export const CONTENT_TYPES: Record<FileName, string> = {
  'drawing.pdf': 'application/pdf',
  'plate.dxf': 'image/vnd.dxf',
  'plate.step': 'model/step',
  'plate.svg': 'image/svg+xml',
  'holes.csv': 'text/csv; charset=utf-8',
};

/** Download name with part number and revision, e.g. PW-0042-rev3.dxf, PW-0042-rev3-drawing.pdf. */
export function downloadName(partNumber: string, revision: number, name: FileName): string {
  const base = `${partNumber}-rev${revision}`;
  switch (name) {
    case 'plate.dxf':
      return `${base}.dxf`;
    case 'plate.step':
      return `${base}.step`;
    case 'plate.svg':
      return `${base}.svg`;
    case 'drawing.pdf':
      return `${base}-drawing.pdf`;
    case 'holes.csv':
      return `${base}-holes.csv`;
  }
}

export function isFileName(name: string): name is FileName {
  return (FILE_NAMES as readonly string[]).includes(name);
}
