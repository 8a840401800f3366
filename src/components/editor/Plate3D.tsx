import type { PlateProfile } from '~/domain';

/** 3D view of the kernel's display mesh. */
export default function Plate3D({ profile }: { profile: PlateProfile | null }) {
  return (
    <div className="flex h-full items-center justify-center p-6 text-center text-plate-700" data-testid="plate-3d">
      {profile ? 'The 3D kernel is not part of this build yet; the drawing is exact.' : 'Nothing to show: the plate cannot be laid out.'}
    </div>
  );
}
