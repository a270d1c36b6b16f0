// The released demo rules judged on a freshly generated set (runs in a plain Node process; see in-node.ts).
import { FAMILY_NAMES, type FamilyName } from '../../server/demo';
import { releasedDemoRules } from '../../server/seed/rules';
import { countVerdict, emptyConfusionMatrix, type ConfusionMatrix } from '../../server/seed/rules/agreement';
import { judgeDemoPhotos } from '../../server/seed/rules/judge-demo-photos';
import { loadKernelLibrary } from '../../server/vision/kernel-library';

export async function confusionOnFreshSet(seed: number, perFamily: number): Promise<Record<FamilyName, ConfusionMatrix>> {
  const kernels = await loadKernelLibrary();
  const matrices = Object.fromEntries(FAMILY_NAMES.map((family) => [family, emptyConfusionMatrix()])) as Record<FamilyName, ConfusionMatrix>;
  const options = {
    count: perFamily * FAMILY_NAMES.length,
    seed,
    sizes: [
      { width: 640, height: 480 },
      { width: 1296, height: 972 },
    ],
    // The released limits are in 8-bit grey levels (the demo stations' cameras); a 16-bit photo's focus and
    // mean are 257 and 257² times larger, so it needs a rule version of its own.
    sixteenBitShare: 0,
  };
  for await (const { truth, run } of judgeDemoPhotos(releasedDemoRules(), options, kernels)) countVerdict(matrices[truth.family], truth.label, run.verdict);
  return matrices;
}
