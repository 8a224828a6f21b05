import type { Request, Response } from 'express';
import { can } from '../../../shared/permissions';
import { OrderIdParamsSchema, OrderSpecificationSchema, ReportIssueSchema, ReportNumberParamsSchema } from '../../../shared/schemas/reports';
import { buildOrderResults, issueReport, readReportPdf } from '../../commands/report';
import { chooseSpecification } from '../../commands/results';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';

/** GET /api/reports/orders/:orderId: specimens with results and verdicts, blockers, reports issued. */
export async function getOrderResults(req: Request, res: Response): Promise<void> {
  const { orderId } = parsed(req, OrderIdParamsSchema, 'params');
  const canIssue = req.actor?.kind === 'user' && can(req.actor.role, 'results.write');
  res.json(await buildOrderResults(req.ctx, orderId, canIssue));
}

/** PUT /api/reports/orders/:orderId/specification: the specification the order is judged against. */
export async function putOrderSpecification(req: Request, res: Response): Promise<void> {
  const user = currentUser(req);
  const { orderId } = parsed(req, OrderIdParamsSchema, 'params');
  await chooseSpecification(req.ctx, orderId, parsed(req, OrderSpecificationSchema).specKey, user.id);
  res.json(await buildOrderResults(req.ctx, orderId, true));
}

/** POST /api/reports: issues the order's report, signed (201). */
export async function postReport(req: Request, res: Response): Promise<void> {
  const user = currentUser(req);
  const issued = await issueReport(req.ctx, parsed(req, ReportIssueSchema), { id: user.id, role: user.role, name: user.name, email: user.email });
  res.status(201).json(issued);
}

/** GET /api/reports/:number/pdf: the report as signed. */
export async function getReportPdf(req: Request, res: Response): Promise<void> {
  const { number } = parsed(req, ReportNumberParamsSchema, 'params');
  const { pdf, sha256 } = await readReportPdf(req.ctx, number);
  res.set('Content-Type', 'application/pdf');
  res.set('Content-Disposition', `inline; filename="${number}.pdf"`);
  res.set('X-Content-SHA256', sha256);
  res.send(pdf);
}
