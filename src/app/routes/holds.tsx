import { PageHeader } from '../../components/ui/page-header';
import { useMe } from '../../features/auth/api/queries';
import { HoldsList, PlaceHoldForm } from '../../features/retention/components/holds-panel';

/** /holds: legal holds on orders, heats and items; nothing they cover can be disposed of or returned. */
export function HoldsRoute() {
  const me = useMe();
  const canWrite = me.data?.permissions.includes('retention.write') ?? false;
  return (
    <>
      <PageHeader title="Holds" subtitle="A hold keeps everything it covers in the store until it is released with a signature." />
      <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
        <HoldsList canWrite={canWrite} />
        {canWrite ? <PlaceHoldForm /> : null}
      </div>
    </>
  );
}
