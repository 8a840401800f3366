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

export function isFileName(name: string): name is FileName {
  return (FILE_NAMES as readonly string[]).includes(name);
}
