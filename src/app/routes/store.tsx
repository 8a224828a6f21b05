import { useQuery } from '@tanstack/react-query';
import { ButtonLink } from '../../components/ui/button';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { storeQueries } from '../../features/store/api/store';
import { PutAwayPanel } from '../../features/store/components/put-away-panel';
import { StoreBranch } from '../../features/store/components/store-tree';

/** /store: what sits where in the retained-sample store, shelf by shelf, and putting things away. */
export function StoreRoute() {
  const tree = useQuery(storeQueries.tree());
  return (
    <>
      <PageHeader
        title="Store"
        subtitle="Shelves, boxes and bags with what they hold. Moving a box moves everything in it."
        actions={<ButtonLink to={paths.retention.path}>Due list</ButtonLink>}
      />
      <div className="grid gap-4 lg:grid-cols-[1fr_24rem]">
        <div className="flex flex-col gap-4">
          <Panel title="Storage">
            {tree.error ? <p role="alert" className="text-stop-700">▲ {tree.error.message}</p> : null}
            {tree.data && tree.data.roots.length === 0 ? <p className="text-ink-500">No shelves, boxes or bags are registered yet.</p> : null}
            <ul className="flex flex-col gap-1" aria-label="Storage tree">
              {(tree.data?.roots ?? []).map((node) => (
                <StoreBranch key={node.code} node={node} />
              ))}
            </ul>
          </Panel>
          {tree.data && tree.data.bins.length > 0 ? (
            <Panel title="Bins waiting to be emptied">
              <ul className="flex flex-col gap-1">
                {tree.data.bins.map((node) => (
                  <StoreBranch key={node.code} node={node} depth={3} />
                ))}
              </ul>
            </Panel>
          ) : null}
        </div>
        <PutAwayPanel />
      </div>
    </>
  );
}
