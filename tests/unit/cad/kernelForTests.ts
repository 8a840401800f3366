/** One kernel instance per test file (started in beforeAll). */
import { startKernelInstance, type OC } from '../../../src/cad/kernel.node.ts';

export async function startTestKernel(): Promise<OC> {
  return startKernelInstance();
}
