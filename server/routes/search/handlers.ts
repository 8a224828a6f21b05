import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { normalizeCode } from '../../../shared/domain/codes';
import { SearchQuerySchema, type SearchHit, type SearchResult } from '../../../shared/schemas/trace';
import { parsed } from '../../middleware/validate';

/** Escapes LIKE's wildcards so a typed % or _ matches itself. */
function likeText(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/**
 * GET /api/search?q=: item codes (specimens, halves, containers), sample codes, heat numbers,
 * order numbers and purchase-order references in one list, exact matches first, then those
 * that start with the text, then those that contain it. Codes match with or without hyphens.
 */
export async function getSearch(req: Request, res: Response): Promise<void> {
  const { q, limit } = parsed(req, SearchQuerySchema, 'query');
  const compact = normalizeCode(q);
  const hits = await req.ctx.sequelize.query<SearchHit & { rank: number }>(
    `WITH hits AS (
       SELECT i.kind::text AS kind, i.id::integer AS id, i.code AS label, i.code AS code, i.state AS state, 'code' AS matched,
              CASE i.kind WHEN 'specimen' THEN coalesce('Sample ' || sa.code || ' · order ' || o.number, 'Specimen')
                          WHEN 'half' THEN 'Half of ' || coalesce(p.code, 'a specimen')
                          ELSE coalesce(initcap(c.container_type) || ' ' || c.name, 'Container') END AS detail,
              replace(i.code, '-', '') AS key, $2::text AS wanted
         FROM items i
         LEFT JOIN specimens s ON s.item_id = i.id LEFT JOIN samples sa ON sa.id = s.sample_id
         LEFT JOIN orders o ON o.id = sa.order_id LEFT JOIN items p ON p.id = i.parent_item_id
         LEFT JOIN containers c ON c.item_id = i.id
        WHERE $2 <> '' AND replace(i.code, '-', '') LIKE '%' || $4 || '%'
       UNION ALL
       SELECT 'sample', sa.id, sa.code, NULL, NULL, 'sample_code', 'Order ' || o.number || ' · heat ' || h.heat_number,
              upper(sa.code), upper($1)
         FROM samples sa JOIN orders o ON o.id = sa.order_id JOIN heats h ON h.id = sa.heat_id
        WHERE sa.code ILIKE '%' || $3 || '%'
       UNION ALL
       SELECT 'heat', h.id, h.heat_number, NULL, NULL, 'heat_number', h.producer || ' · ' || h.material || ' ' || h.grade,
              upper(h.heat_number), upper($1)
         FROM heats h WHERE h.heat_number ILIKE '%' || $3 || '%'
       UNION ALL
       SELECT 'order', o.id, o.number, NULL, NULL, 'order_number', cu.name || ' · PO ' || o.po_reference,
              upper(o.number), upper($1)
         FROM orders o JOIN customers cu ON cu.id = o.customer_id WHERE o.number ILIKE '%' || $3 || '%'
       UNION ALL
       SELECT 'order', o.id, o.po_reference, NULL, NULL, 'po_reference', 'Order ' || o.number || ' · ' || cu.name,
              upper(o.po_reference), upper($1)
         FROM orders o JOIN customers cu ON cu.id = o.customer_id WHERE o.po_reference ILIKE '%' || $3 || '%'
     )
     SELECT kind, id, label, detail, matched, code, state,
            CASE WHEN key = wanted THEN 0 WHEN key LIKE wanted || '%' THEN 1 ELSE 2 END AS rank
       FROM hits ORDER BY rank, label LIMIT $5`,
    { bind: [q, compact, likeText(q), likeText(compact), limit], type: QueryTypes.SELECT },
  );
  const body: SearchResult = { q, hits: hits.map(({ rank: _rank, ...hit }) => hit) };
  res.json(body);
}
