import type { StoreNode } from '../../../../shared/schemas/retention';
import { StateBadge } from '../../../components/ui/state-badge';
import { Verdict } from '../../retention/components/due-columns';

const TYPE_GLYPH: Record<string, string> = { shelf: '▭', box: '▣', bag: '◫', bin: '⊔', cart: '⛟' };

/** One container and everything in it, opened by default down to the bags. */
export function StoreBranch({ node, depth = 0 }: { node: StoreNode; depth?: number }) {
  return (
    <li className="flex flex-col" data-container={node.code}>
      <details open={depth < 3} className="group">
        <summary className="flex min-h-11 cursor-pointer list-none flex-wrap items-center gap-2 rounded-md px-2 py-1 hover:bg-ink-50">
          <span aria-hidden className="w-4 text-ink-500 group-open:rotate-90">›</span>
          <span aria-hidden>{TYPE_GLYPH[node.containerType] ?? '□'}</span>
          <span className="font-semibold">{node.name}</span>
          <span className="font-mono text-caption text-ink-500">{node.code}</span>
          <span className="text-caption text-ink-500">
            {node.containerType} · {node.total} piece{node.total === 1 ? '' : 's'}
          </span>
        </summary>
        <ul className="ml-5 flex flex-col border-l border-ink-100 pl-3">
          {node.children.map((child) => (
            <StoreBranch key={child.code} node={child} depth={depth + 1} />
          ))}
          {node.items.map((item) => (
            <li key={item.code} className="flex flex-wrap items-center gap-2 px-2 py-1 text-body" data-item={item.code}>
              <span className="font-mono">{item.code}</span>
              <StateBadge state={item.state} />
              <span className="text-caption text-ink-500">
                {item.order ? `order ${item.order}` : ''} {item.heat ? `· heat ${item.heat}` : ''}
              </span>
              {item.status ? (
                <span className="text-caption">
                  <Verdict status={item.status as 'may_go' | 'not_due' | 'held' | 'not_retained'} /> {item.firstDay ? `from ${item.firstDay}` : ''}
                </span>
              ) : null}
            </li>
          ))}
        </ul>
      </details>
    </li>
  );
}
