import { BatchScreen } from '../../features/disposals/components/batch-screen';
import { RecentBatches } from '../../features/disposals/components/batch-list';

/** /disposals: scan a disposal or return batch, sign it, and find earlier batches' documents. */
export function DisposalsRoute() {
  return (
    <>
      <BatchScreen />
      <RecentBatches />
    </>
  );
}
