/**
 * What made a file: stored beside every artefact of an approved revision, so a later kernel
 * upgrade can be told apart from the bytes that were approved. Kept in step with package.json
 * (a unit test compares the two).
 */
export const KERNEL_PACKAGES = { replicad: '1.1.0', 'replicad-opencascadejs': '1.1.0' } as const;
export const KERNEL_VERSION = `replicad ${KERNEL_PACKAGES.replicad} / replicad-opencascadejs ${KERNEL_PACKAGES['replicad-opencascadejs']} (OCCT 8 wasm)`;
